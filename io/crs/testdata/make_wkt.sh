#!/bin/sh
# Makes wkt.tsv, the outside reference of io/crs: for each EPSG code, the
# definitions GDAL (Debian's gdal-bin, gdalsrsinfo, from the EPSG dataset it
# ships) writes in the first (wkt1), second (wkt2_2019) edition and ESRI's
# form, one line each, with GDAL's linear unit factor of the system ("" for
# a geographic one). Run from this folder: sh make_wkt.sh > wkt.tsv
# It also checks every code of the ranges io/crs.Lookup claims, printing
# to stderr any whose unit GDAL gives otherwise.
set -eu
export OSR_USE_NON_DEPRECATED=NO
codes="4326 4269 4267 4258 4283 7844 4617 4674 4167 4612 6668 4490 4148 4230 4277 4171 6318 4759 4152 4019
3857 3395 6933 8857 5070 2163 9311 6350 3338 3035 3034 27700 2154 3005 3347 3978 3577 9473 2193 3006 3067 25832 31467 2056 3763 5514 3310 3081 3083
2225 2226 2227 2228 2229 2230 2263 2260 2261 2262 2276 2277 2278 2279 2275 2236 2237 2238 2240 2239 2248 2272 2271 2283 2284 2264 2926 2927 3435 3436
2251 2252 2253 2267 2268 2269 2270 2222 2223 2224
32601 32660 32701 32760 26901 26923 25828 25838 26929 26998 28348 28358 7846 7859 4978"
unit() { gdalsrsinfo -o proj4 "EPSG:$1" 2>/dev/null | tr ' ' '\n' | sed -n 's/^+to_meter=//p; s/^+units=m$/1/p; s/^+units=us-ft$/0.304800609601219/p; s/^+units=ft$/0.3048/p' | head -1; }
for c in $codes; do
  w1=$(gdalsrsinfo -o wkt1 "EPSG:$c" | tr -s ' \n' ' ' | sed 's/^ //; s/ $//')
  w2=$(gdalsrsinfo -o wkt2_2019 "EPSG:$c" | tr -s ' \n' ' ' | sed 's/^ //; s/ $//')
  we=$(gdalsrsinfo -o wkt_esri "EPSG:$c" | tr -s ' \n' ' ' | sed 's/^ //; s/ $//')
  printf '%s\t%s\t%s\t%s\t%s\n' "$c" "$(unit $c)" "$w1" "$w2" "$we"
done
for r in "32601 32660" "32701 32760" "26901 26923" "25828 25838" "26929 26998" "28348 28358" "7846 7859"; do
  for c in $(seq $r); do
    u=$(unit $c)
    [ "$u" = 1 ] || echo "EPSG:$c in a metre range has unit '$u'" >&2
  done
done
