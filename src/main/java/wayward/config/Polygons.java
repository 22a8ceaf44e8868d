package wayward.config;

/** Plane geometry a zone's polygon is checked with. */
final class Polygons {
    private Polygons() {
    }

    /**
     * The first pair of edges that cross, edge i running from point i to point i + 1 (the last back to point 0),
     * or null for a simple polygon. Edges that share a point are not compared; touching counts as crossing.
     * O(n²) over a zone's few points.
     */
    static int[] crossingEdges(double[] xs, double[] ys) {
        int n = xs.length;
        for (int i = 0; i < n; i++) {
            for (int j = i + 2; j < n; j++) {
                if (i == 0 && j == n - 1) {
                    continue; // neighbours through point 0
                }
                int i2 = (i + 1) % n;
                int j2 = (j + 1) % n;
                if (segmentsMeet(xs[i], ys[i], xs[i2], ys[i2], xs[j], ys[j], xs[j2], ys[j2])) {
                    return new int[] {i, j};
                }
            }
        }
        return null;
    }

    /** Segments ab and cd share a point (orientation tests; collinear overlaps included). Common practice. */
    static boolean segmentsMeet(double ax, double ay, double bx, double by, double cx, double cy, double dx,
            double dy) {
        double d1 = cross(cx, cy, dx, dy, ax, ay);
        double d2 = cross(cx, cy, dx, dy, bx, by);
        double d3 = cross(ax, ay, bx, by, cx, cy);
        double d4 = cross(ax, ay, bx, by, dx, dy);
        if (((d1 > 0 && d2 < 0) || (d1 < 0 && d2 > 0)) && ((d3 > 0 && d4 < 0) || (d3 < 0 && d4 > 0))) {
            return true;
        }
        return (d1 == 0 && within(cx, cy, dx, dy, ax, ay)) || (d2 == 0 && within(cx, cy, dx, dy, bx, by))
                || (d3 == 0 && within(ax, ay, bx, by, cx, cy)) || (d4 == 0 && within(ax, ay, bx, by, dx, dy));
    }

    /** (b − a) × (p − a). */
    private static double cross(double ax, double ay, double bx, double by, double px, double py) {
        return (bx - ax) * (py - ay) - (by - ay) * (px - ax);
    }

    /** p, collinear with ab, lies within its bounding box. */
    private static boolean within(double ax, double ay, double bx, double by, double px, double py) {
        return Math.min(ax, bx) <= px && px <= Math.max(ax, bx) && Math.min(ay, by) <= py && py <= Math.max(ay, by);
    }
}
