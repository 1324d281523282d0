-- weight: 2
-- The discrete distance of one trip to its line.
\set id random(1, 10000)
SELECT discrete_frechet_distance(t.track, r.track) FROM trips t JOIN routes r ON r.id = t.route_id WHERE t.id = :id;
