-- frechet_ext 0.1 -> 0.2.
\echo Use "ALTER EXTENSION frechet_ext UPDATE TO '0.2'" to load this file. \quit
