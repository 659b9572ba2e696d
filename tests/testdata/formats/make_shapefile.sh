#!/bin/sh
# Makes the shapefile fixtures of io/shapefile from tests/testdata/us-states.geojson
# with Debian's gdal-bin (ogr2ogr 3.6.2) and zip. Run from the repository root:
#   sh tests/testdata/formats/make_shapefile.sh
# See README-shapefile.md for what each file holds.
set -eu
src=tests/testdata/us-states.geojson
out=tests/testdata/formats
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT

# Lon/lat, zipped by ogr2ogr itself (states.shp, .shx, .dbf, .prj at the top
# of the zip; the table's language driver byte says windows-1252, no .cpg).
rm -f "$out/states.shp.zip"
ogr2ogr -f "ESRI Shapefile" "$out/states.shp.zip" "$src" -nln states

# Projected to NAD83 / Conus Albers (metres), with a .cpg saying UTF-8,
# zipped inside a folder as people often send them.
mkdir "$tmp/states-5070"
ogr2ogr -f "ESRI Shapefile" -t_srs EPSG:5070 -lco ENCODING=UTF-8 \
	"$tmp/states-5070/states-5070.shp" "$src" -nln states-5070
rm -f "$out/states-5070.zip"
here=$(pwd)
(cd "$tmp" && touch -t 202001010000 states-5070 states-5070/* &&
	zip -X -q -r "$here/$out/states-5070.zip" states-5070)
