-- weight: 1
-- The three trips, among fifty, closest to a line (ORDER BY <->).
\set id random(1, 9950)
SELECT t.id FROM trips t
WHERE t.id BETWEEN :id AND :id + 49
ORDER BY t.track <-> (SELECT track FROM routes WHERE id = 1 + :id % 8)
LIMIT 3;
