-- weight: 4
-- How far did one trip stray from its line?
\set id random(1, 10000)
SELECT frechet_distance(t.track, r.track) FROM trips t JOIN routes r ON r.id = t.route_id WHERE t.id = :id;
