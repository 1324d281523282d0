-- weight: 4
-- Did one trip stay within eps metres of its line?
\set id random(1, 10000)
\set eps random(5, 200)
SELECT frechet_at_most(t.track, r.track, :eps) FROM trips t JOIN routes r ON r.id = t.route_id WHERE t.id = :id;
