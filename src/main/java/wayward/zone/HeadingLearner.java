package wayward.zone;

/**
 * Learns a zone's permitted heading from its traffic: the bearing histogram of moving pixels (16 bins of
 * 22.5°, {@link ZoneReading#directions}) summed over the frames in which the zone is in motion, until the zone
 * has moved for the learning time. The heading is the weighted circular mean of the strongest bin and its two
 * neighbours, once those three hold at least half of all the moving pixels (one clear direction of traffic);
 * until then learning goes on. Analysis thread only; nothing allocated per frame.
 */
public final class HeadingLearner {
    /** A frame counts as traffic when this share of the zone's pixels moves. */
    static final double MOVING_COVERAGE = 0.01;
    /** The strongest direction (three bins) must hold this share of the moving pixels. */
    static final double DOMINANCE = 0.5;

    private final double learnSeconds;
    private final long[] bins = new long[ZoneReading.DIRECTION_BINS];
    private double movingSeconds;

    public HeadingLearner(double learnSeconds) {
        this.learnSeconds = learnSeconds;
    }

    /** Adds one frame pair's reading; {@code dt} stream seconds since the previous one. */
    public void add(ZoneReading r, double dt) {
        if (r.movingShare < MOVING_COVERAGE) {
            return;
        }
        movingSeconds += dt;
        for (int k = 0; k < bins.length; k++) {
            bins[k] += r.directions[k];
        }
    }

    /** Seconds of traffic seen so far. */
    public double movingSeconds() {
        return movingSeconds;
    }

    /** The learned heading in degrees (clockwise from image-up), or NaN while still learning. */
    public double heading() {
        if (movingSeconds < learnSeconds) {
            return Double.NaN;
        }
        long total = 0;
        int best = 0;
        long bestSum = -1;
        int n = bins.length;
        for (int k = 0; k < n; k++) {
            total += bins[k];
            long s = bins[(k + n - 1) % n] + bins[k] + bins[(k + 1) % n];
            if (s > bestSum) {
                bestSum = s;
                best = k;
            }
        }
        if (total == 0 || bestSum < DOMINANCE * total) {
            return Double.NaN;
        }
        double x = 0;
        double y = 0;
        for (int d = -1; d <= 1; d++) {
            int k = (best + d + n) % n;
            double a = Math.toRadians(k * 360.0 / n);
            x += bins[k] * Math.sin(a);
            y += bins[k] * Math.cos(a);
        }
        double h = Math.toDegrees(Math.atan2(x, y));
        return h < 0 ? h + 360 : h;
    }
}
