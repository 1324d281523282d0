-- weight: 1
-- The nightly flag, on fifty trips: which left their line by more than 60 m?
\set id random(1, 9950)
SELECT count(*) FROM trips t JOIN routes r ON r.id = t.route_id
WHERE t.id BETWEEN :id AND :id + 49 AND NOT frechet_at_most(t.track, r.track, 60);
