#!/bin/sh
# Makes the fixtures of io/table and of io/geojson's coordinate systems from
# ../us-states.geojson (see README-table.md). Run once, from this directory:
#   sh make_table.sh
# Needs python3 and Debian's gdal-bin (ogr2ogr).
set -eu
src=../us-states.geojson

# states-attrs.csv: one row per state, keyed by FIPS code written as a
# number, as a spreadsheet saves it: the codes 01 to 09 lose their leading
# zero. CRLF line ends, comma-delimited, quoted where needed.
python3 - "$src" states-attrs.csv <<'PY'
import csv, json, sys
usps = {
    "01": "AL", "02": "AK", "04": "AZ", "05": "AR", "06": "CA", "08": "CO", "09": "CT",
    "10": "DE", "11": "DC", "12": "FL", "13": "GA", "15": "HI", "16": "ID", "17": "IL",
    "18": "IN", "19": "IA", "20": "KS", "21": "KY", "22": "LA", "23": "ME", "24": "MD",
    "25": "MA", "26": "MI", "27": "MN", "28": "MS", "29": "MO", "30": "MT", "31": "NE",
    "32": "NV", "33": "NH", "34": "NJ", "35": "NM", "36": "NY", "37": "NC", "38": "ND",
    "39": "OH", "40": "OK", "41": "OR", "42": "PA", "44": "RI", "45": "SC", "46": "SD",
    "47": "TN", "48": "TX", "49": "UT", "50": "VT", "51": "VA", "53": "WA", "54": "WV",
    "55": "WI", "56": "WY", "60": "AS", "66": "GU", "69": "MP", "72": "PR", "78": "VI",
}
with open(sys.argv[1], encoding="utf-8") as f:
    features = json.load(f)["features"]
with open(sys.argv[2], "w", encoding="utf-8", newline="") as out:
    w = csv.writer(out)  # RFC 4180: CRLF, quotes only where needed
    w.writerow(["fips", "usps", "name", "centroid_lon", "centroid_lat"])
    for ft in features:
        p = ft["properties"]
        w.writerow([int(ft["id"]), usps[ft["id"]], p["name"],
                    repr(p["centroid_lon"]), repr(p["centroid_lat"])])
PY

# states-5070.geojson: the states in NAD83 / Conus Albers (EPSG:5070,
# metres), with the legacy "crs" member GDAL writes when RFC 7946 output is
# off, coordinates to 0.1 m.
rm -f states-5070.geojson
ogr2ogr -f GeoJSON -t_srs EPSG:5070 -lco RFC7946=NO -lco COORDINATE_PRECISION=1 \
    states-5070.geojson "$src"
