-- Writes demo/out/report.html (psql variable `outfile`): one self-contained
-- HTML page with an SVG map of each of the worst trips, drawn from
-- frechet_geojson(trip, line, 60): the line, the trip, the leashes of an
-- optimal matching, the longest leash and the excursions; and the figures.
-- Needs the tables of town.sql and the temp table `flagged` of queries.sql.

-- Text made safe for HTML.
CREATE FUNCTION pg_temp.html(t text) RETURNS text LANGUAGE sql IMMUTABLE AS $$
	SELECT replace(replace(replace(replace(t, '&', '&amp;'), '<', '&lt;'), '>', '&gt;'), '"', '&quot;')
$$;

-- SVG path data of a GeoJSON geometry (y flipped: SVG's y runs down).
CREATE FUNCTION pg_temp.svg_d(g jsonb) RETURNS text LANGUAGE sql IMMUTABLE AS $$
	SELECT CASE g->>'type'
		WHEN 'Point' THEN format('M%s,%s h0', round((g->'coordinates'->>0)::numeric, 1), -round((g->'coordinates'->>1)::numeric, 1))
		WHEN 'LineString' THEN (SELECT string_agg(CASE WHEN o = 1 THEN 'M' ELSE 'L' END
		                          || round((c->>0)::numeric, 1) || ',' || -round((c->>1)::numeric, 1), ' ' ORDER BY o)
		                        FROM jsonb_array_elements(g->'coordinates') WITH ORDINALITY e(c, o))
		WHEN 'MultiLineString' THEN (SELECT string_agg(pg_temp.svg_d(jsonb_build_object('type', 'LineString', 'coordinates', l)), ' ' ORDER BY o)
		                             FROM jsonb_array_elements(g->'coordinates') WITH ORDINALITY e(l, o))
	END
$$;

-- The trips to map: the worst of each kind of flagged trip (three detours).
CREATE TEMP TABLE worst AS
SELECT f.*, t.track, l.route, l.name AS line_name, frechet_geojson(t.track, l.route, :eps) AS gj
FROM (SELECT *, row_number() OVER (PARTITION BY story LIKE 'detour%', split_part(story, ' ', 1) ORDER BY frechet_m DESC) AS in_kind
      FROM flagged) f
JOIN trip t USING (trip_id) JOIN bus_line l ON l.line_id = f.line_id
WHERE f.in_kind <= CASE WHEN f.story LIKE 'detour%' THEN 3 ELSE 1 END;

-- One figure per trip: the map and its table.
CREATE TEMP TABLE figure AS
SELECT w.trip_id, w.frechet_m,
	CASE WHEN w.story LIKE 'detour%' THEN 1 WHEN w.story = 'GPS glitch' THEN 2
	     WHEN w.story = 'driven backwards' THEN 4 ELSE 3 END AS kind_order,
	format($f$<section class="trip" id="trip-%1$s">
<h2>Trip %1$s <small>%2$s, line %3$s (%4$s)</small></h2>
<div class="row">
<svg class="map" id="map-%1$s" xmlns="http://www.w3.org/2000/svg" viewBox="%5$s" preserveAspectRatio="xMidYMid meet" role="img" aria-label="map of trip %1$s against line %3$s">
<rect class="ground" x="%6$s" y="%7$s" width="%8$s" height="%9$s"/>
<path class="route" d="%10$s"/>
<path class="leashes" d="%11$s"/>
%12$s
<path class="trip" d="%13$s"/>
<path class="bottleneck" d="%14$s"/>
<text class="label" x="%15$s" y="%16$s" text-anchor="%27$s" style="font-size: %26$spx">line start</text>
</svg>
<table class="figures">
<tr><th>story (simulation)</th><td>%2$s</td></tr>
<tr><th>Fréchet distance</th><td>%17$s m</td></tr>
<tr><th>ε (flag threshold)</th><td>%18$s m</td></tr>
<tr><th>discrete Fréchet</th><td>%19$s m</td></tr>
<tr><th>GPS fixes / line vertices</th><td>%20$s / %21$s</td></tr>
<tr><th>longest leash</th><td>trip position %22$s ↔ line position %23$s</td></tr>
<tr><th>excursions</th><td>%24$s</td></tr>
<tr><th>part of the line followed</th><td>%25$s</td></tr>
</table>
</div>
</section>$f$,
		w.trip_id, pg_temp.html(w.story), w.line_id, pg_temp.html(w.line_name),
		format('%s %s %s %s', bb.x0, -bb.y1, bb.x1 - bb.x0, bb.y1 - bb.y0),
		bb.x0, -bb.y1, bb.x1 - bb.x0, bb.y1 - bb.y0,
		pg_temp.svg_d(w.gj->'features'->1->'geometry'),
		pg_temp.svg_d(w.gj->'features'->2->'geometry'),
		coalesce((SELECT string_agg(format('<path class="excursion" d="%s"><title>excursion %s: trip vertices %s-%s, %s m out</title></path>',
		                                   pg_temp.svg_d(f->'geometry'), f->'properties'->>'number',
		                                   f->'properties'->>'trip_from', f->'properties'->>'trip_to',
		                                   round((f->'properties'->>'max_leash')::numeric)), E'\n' ORDER BY o)
		          FROM jsonb_array_elements(w.gj->'features') WITH ORDINALITY e(f, o)
		          WHERE f->'properties'->>'role' = 'excursion'), ''),
		pg_temp.svg_d(w.gj->'features'->0->'geometry'),
		pg_temp.svg_d(w.gj->'features'->3->'geometry'),
		round((w.route[1])[0]::numeric), -round((w.route[1])[1]::numeric) - greatest(bb.x1 - bb.x0, bb.y1 - bb.y0) / 40,
		round(w.frechet_m::numeric, 1), :eps, round(w.discrete_m::numeric, 1),
		array_length(w.track, 1), array_length(w.route, 1),
		round((w.gj->'features'->3->'properties'->>'a_pos')::numeric, 2),
		round((w.gj->'features'->3->'properties'->>'b_pos')::numeric, 2),
		coalesce((SELECT string_agg(format('trip vertices %s–%s left the line at %s, rejoined at %s; %s m out, %s m driven, %s m of line skipped',
		                                   x.trip_from, x.trip_to, round(x.route_from::numeric, 2), round(x.route_to::numeric, 2),
		                                   round(x.max_leash::numeric), round(x.trip_length::numeric),
		                                   round(x.route_length::numeric)), '<br>' ORDER BY x.trip_from)
		          FROM frechet_excursions(w.track, w.route, :eps) x), 'none'),
		coalesce((SELECT format('line positions %s to %s, within %s m', round(p.route_from::numeric, 2),
		                        round(p.route_to::numeric, 2), round(p.distance::numeric, 1))
		          FROM frechet_partial_match(w.track, w.route, :eps) p), 'no part within ε'),
		round(greatest(bb.x1 - bb.x0, bb.y1 - bb.y0) / 30),
		CASE WHEN (w.route[1])[0] > (bb.x0 + bb.x1) / 2 THEN 'end' ELSE 'start' END) AS html
FROM worst w,
	LATERAL (SELECT floor(min(x) - 0.06 * greatest(max(x) - min(x), max(y) - min(y)) - 60) AS x0,
	                ceil(max(x) + 0.06 * greatest(max(x) - min(x), max(y) - min(y)) + 60) AS x1,
	                floor(min(y) - 0.06 * greatest(max(x) - min(x), max(y) - min(y)) - 60) AS y0,
	                ceil(max(y) + 0.06 * greatest(max(x) - min(x), max(y) - min(y)) + 60) AS y1
	         FROM (SELECT p[0] AS x, p[1] AS y FROM unnest(w.track || w.route) p) pts) bb;

\pset format unaligned
\pset tuples_only on
\pset footer off
\o :outfile
SELECT format($h$<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<title>Wrenmere Valley Buses: off-route trips</title>
<style>
body { font: 15px/1.45 system-ui, sans-serif; margin: 24px auto; max-width: 1180px; color: #222; background: #fff; }
h1 { font-size: 24px; margin-bottom: 4px; } h2 { font-size: 18px; margin: 0 0 8px; } h2 small { font-weight: normal; color: #555; }
.lede { color: #444; margin-top: 0; }
table { border-collapse: collapse; } th, td { text-align: left; padding: 3px 10px; border-bottom: 1px solid #ddd; vertical-align: top; }
th { font-weight: 600; color: #333; }
.summary td.n { text-align: right; font-variant-numeric: tabular-nums; }
section.trip { border-top: 2px solid #ccc; padding: 14px 0; }
.row { display: flex; gap: 20px; align-items: flex-start; }
svg.map { width: 560px; height: 420px; flex: none; border: 1px solid #bbb; background: #f7f5ef; }
svg .ground { fill: #f7f5ef; }
svg .route { fill: none; stroke: #2b6cb0; stroke-width: 7px; stroke-opacity: 0.45; stroke-linejoin: round; stroke-linecap: round; vector-effect: non-scaling-stroke; }
svg .trip { fill: none; stroke: #1a202c; stroke-width: 1.6px; stroke-linejoin: round; vector-effect: non-scaling-stroke; }
svg .leashes { fill: none; stroke: #718096; stroke-width: 0.7px; stroke-opacity: 0.7; vector-effect: non-scaling-stroke; }
svg .excursion { fill: none; stroke: #e53e3e; stroke-width: 4px; stroke-opacity: 0.85; stroke-linecap: round; vector-effect: non-scaling-stroke; }
svg .bottleneck { fill: none; stroke: #dd6b20; stroke-width: 2.5px; stroke-dasharray: 6 4; vector-effect: non-scaling-stroke; }
svg .label { fill: #2b6cb0; font-weight: 600; }
.legend span { display: inline-block; margin-right: 18px; } .legend i { display: inline-block; width: 26px; height: 0; vertical-align: middle; margin-right: 6px; border-top: 4px solid; }
.figures { font-size: 14px; } .note { color: #555; font-size: 13px; }
#selfcheck { display: none; }
</style>
</head>
<body>
<h1>Wrenmere Valley Buses: off-route trips</h1>
<p class="lede">An invented town and simulated GPS trips. Each trip is checked against its planned line with the
continuous Fréchet distance (frechet_ext); trips farther than ε = %1$s m are flagged. The maps show the worst
trip of each kind (three detours), detours first, drawn from <code>frechet_geojson(trip, line, %1$s)</code>.</p>
<table class="summary">
<tr><th>bus lines</th><td class="n">%2$s</td><th>trips</th><td class="n">%3$s</td><th>GPS fixes</th><td class="n">%4$s</td></tr>
<tr><th>flagged (&gt; %1$s m)</th><td class="n">%5$s</td><th>detours</th><td class="n">%6$s</td><th>driven backwards</th><td class="n">%7$s</td></tr>
<tr><th>partial trips</th><td class="n">%8$s</td><th>GPS glitches</th><td class="n">%9$s</td><th>ordinary trips flagged</th><td class="n">%10$s</td></tr>
<tr><th>data load</th><td class="n">%11$s s</td><th>maps below</th><td class="n">%12$s</td><th></th><td></td></tr>
</table>
<p class="legend"><span><i style="border-color:#2b6cb0;opacity:.5"></i>planned line</span><span><i style="border-color:#1a202c;border-top-width:2px"></i>trip (GPS)</span>
<span><i style="border-color:#718096;border-top-width:1px"></i>leashes of the matching</span><span><i style="border-color:#e53e3e"></i>excursion (beyond ε)</span>
<span><i style="border-color:#dd6b20;border-top-style:dashed"></i>longest leash</span></p>
<p class="note">A Fréchet score is geometric evidence, not proof of misconduct: it includes GPS error, gaps and the quality of the planned line.
Treat a high score as a reason to look.</p>
%13$s
<pre id="selfcheck"></pre>
<script>
// Self-check for the screenshot test: what the browser laid out in each map.
(function () {
	var maps = Array.prototype.slice.call(document.querySelectorAll('svg.map'));
	function drawn(svg, sel) {
		return Array.prototype.slice.call(svg.querySelectorAll(sel)).filter(function (el) {
			var b = el.getBBox(); return b.width > 0 || b.height > 0;
		}).length;
	}
	var out = maps.map(function (svg) {
		return { id: svg.id, route: drawn(svg, 'path.route'), trip: drawn(svg, 'path.trip'),
			leashes: drawn(svg, 'path.leashes'), excursions: drawn(svg, 'path.excursion'),
			bottleneck: drawn(svg, 'path.bottleneck'), width: svg.getBoundingClientRect().width };
	});
	document.getElementById('selfcheck').textContent = JSON.stringify({ maps: out });
})();
</script>
</body>
</html>$h$,
	:eps,
	(SELECT count(*) FROM bus_line), (SELECT count(*) FROM trip), (SELECT sum(array_length(track, 1)) FROM trip),
	(SELECT count(*) FROM flagged), (SELECT count(*) FROM flagged WHERE story LIKE 'detour%'),
	(SELECT count(*) FROM flagged WHERE story = 'driven backwards'),
	(SELECT count(*) FROM flagged WHERE story IN ('turned back early', 'joined the line late', 'middle part of the line only')),
	(SELECT count(*) FROM flagged WHERE story = 'GPS glitch'), (SELECT count(*) FROM flagged WHERE story = 'ordinary'),
	:'load_s', (SELECT count(*) FROM figure),
	(SELECT string_agg(html, E'\n' ORDER BY kind_order, frechet_m DESC) FROM figure));
\o
\pset format aligned
\pset tuples_only off
\pset footer on
