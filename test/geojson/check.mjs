// Validates GeoJSON texts with @placemarkio/check-geojson (npm, MIT; RFC 7946
// structure: types, members, positions, no properties on a FeatureCollection),
// plus RFC 7946 section 4's lon/lat ranges where the sample says "lonlat".
// Input lines: "label<TAB>kind<TAB>json", kind one of plain, lonlat, invalid
// (invalid: a negative control that the validator must reject).
// Output: TAP lines "ok N - label" / "not ok N - label: reason".
import { createRequire } from 'node:module';
import { createInterface } from 'node:readline';

const require = createRequire(import.meta.url);
const { getIssues } = require('@placemarkio/check-geojson');

// Yields every position of a geometry.
function* positions(geom) {
	if (!geom) return;
	const c = geom.coordinates;
	switch (geom.type) {
		case 'Point': yield c; break;
		case 'LineString': case 'MultiPoint': yield* c; break;
		case 'MultiLineString': case 'Polygon': for (const l of c) yield* l; break;
		case 'GeometryCollection': for (const g of geom.geometries) yield* positions(g); break;
	}
}

let n = 0;
let bad = 0;
const rl = createInterface({ input: process.stdin });
for await (const line of rl) {
	if (!line.trim()) continue;
	const [label, kind, text] = line.split('\t');
	n++;
	let problems = getIssues(text).map((i) => i.message);
	if (kind === 'lonlat' && problems.length === 0) {
		for (const f of JSON.parse(text).features)
			for (const [lon, lat] of positions(f.geometry))
				if (!(lon >= -180 && lon <= 180 && lat >= -90 && lat <= 90))
					problems.push(`position ${lon},${lat} outside lon/lat range`);
	}
	if (kind === 'invalid')
		problems = problems.length > 0 ? [] : ['validator accepted a known-bad sample'];
	if (problems.length === 0)
		console.log(`ok ${n} - ${label}`);
	else {
		bad++;
		console.log(`not ok ${n} - ${label}: ${problems.slice(0, 3).join('; ')}`);
	}
}
console.log(`1..${n}`);
process.exit(bad > 0 || n === 0 ? 1 : 0);
