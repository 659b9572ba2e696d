#!/bin/sh
# Makes the GeoPackage fixtures of io/gpkg from ../us-states.geojson with
# Debian's gdal-bin (ogr2ogr). Run from this folder; see README-gpkg.md.
set -eu
src=../us-states.geojson
rm -f states.gpkg states-5070.gpkg

# Lon/lat (EPSG:4326), as the GeoJSON. The GeoJSON "id" becomes a field
# named "id" (ogr2ogr keeps string ids as a field); the fid is 1..56.
ogr2ogr -f GPKG states.gpkg "$src" -nln states -nlt MULTIPOLYGON \
    -lco SPATIAL_INDEX=NO -a_srs EPSG:4326

# The same states projected to NAD83 / Conus Albers (EPSG:5070, metres).
ogr2ogr -f GPKG states-5070.gpkg "$src" -nln states -nlt MULTIPOLYGON \
    -lco SPATIAL_INDEX=NO -s_srs EPSG:4326 -t_srs EPSG:5070
