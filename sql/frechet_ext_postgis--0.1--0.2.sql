-- frechet_ext_postgis 0.1 -> 0.2.
\echo Use "ALTER EXTENSION frechet_ext_postgis UPDATE TO '0.2'" to load this file. \quit
