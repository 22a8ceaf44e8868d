package wayward.zone;

/**
 * How a {@link MoverTracker} finds and follows movers. Checked here, at construction, so the tracker's loops
 * need no checks.
 *
 * @param minSpeedPxPerSecond      a sample moves when its flow is at least this fast, analysis pixels per second
 * @param minConfidence            smallest structure-tensor eigenvalue for a full flow vector; a sample below it
 *                                 whose largest eigenvalue reaches it lies on a straight edge and votes with its
 *                                 normal flow, (grey levels per pixel)²
 * @param toleranceDeg             ± degrees around the opposite of the heading that count as against (and around
 *                                 the heading as with it); 0 to 90
 * @param groupAngleDeg            a sample joins a group when its motion lies within this angle of the group's;
 *                                 edge samples, which only show the part of the motion across the edge, get 30°
 *                                 more (capped below 90°); 5 to 80
 * @param slowSeconds              time constant of the per-sample average of the flow, stream seconds; it carries
 *                                 slow movers through sensor noise (see {@link MoverTracker}); 0 turns it off
 * @param slowMinSpeedPxPerSecond  a sample whose averaged flow reaches this speed (and whose present flow agrees
 *                                 with it) moves too, px/s; at most minSpeedPxPerSecond
 * @param lostSeconds              a track that found no group for longer than this is dropped, stream seconds
 * @param gatePx                   a group more than this (plus half the track's size) from a track's predicted
 *                                 centroid is not that track, analysis pixels
 */
public record MoverSettings(double minSpeedPxPerSecond, double minConfidence, double toleranceDeg,
        double groupAngleDeg, double slowSeconds, double slowMinSpeedPxPerSecond, double lostSeconds,
        double gatePx) {
    /** Group angle, averaging time, slow floor, lost time and gate used unless a test sets its own. */
    public static final double GROUP_ANGLE_DEG = 45;
    public static final double SLOW_SECONDS = 0.75;
    public static final double SLOW_MIN_SPEED = 2.5;
    public static final double LOST_SECONDS = 0.5;
    public static final double GATE_PX = 16;

    /** The zone's speed floor, confidence floor and tolerance with the tracker's own defaults. */
    public static MoverSettings of(double minSpeedPxPerSecond, double minConfidence, double toleranceDeg) {
        return new MoverSettings(minSpeedPxPerSecond, minConfidence, toleranceDeg, GROUP_ANGLE_DEG, SLOW_SECONDS,
                Math.min(SLOW_MIN_SPEED, minSpeedPxPerSecond), LOST_SECONDS, GATE_PX);
    }

    public MoverSettings {
        if (!(minSpeedPxPerSecond >= 0)) {
            throw new IllegalArgumentException("minSpeedPxPerSecond: " + minSpeedPxPerSecond + " (expected 0 or more)");
        }
        if (!(minConfidence >= 0)) {
            throw new IllegalArgumentException("minConfidence: " + minConfidence + " (expected 0 or more)");
        }
        if (!(toleranceDeg >= 0 && toleranceDeg <= 90)) {
            throw new IllegalArgumentException("toleranceDeg: " + toleranceDeg + " (expected 0 to 90)");
        }
        if (!(groupAngleDeg >= 5 && groupAngleDeg <= 80)) {
            throw new IllegalArgumentException("groupAngleDeg: " + groupAngleDeg + " (expected 5 to 80)");
        }
        if (!(slowSeconds >= 0 && slowSeconds <= 10)) {
            throw new IllegalArgumentException("slowSeconds: " + slowSeconds + " (expected 0 to 10)");
        }
        if (!(slowMinSpeedPxPerSecond >= 0 && slowMinSpeedPxPerSecond <= minSpeedPxPerSecond)) {
            throw new IllegalArgumentException("slowMinSpeedPxPerSecond: " + slowMinSpeedPxPerSecond
                    + " (expected 0 to minSpeedPxPerSecond " + minSpeedPxPerSecond + ")");
        }
        if (!(lostSeconds >= 0 && lostSeconds <= 10)) {
            throw new IllegalArgumentException("lostSeconds: " + lostSeconds + " (expected 0 to 10)");
        }
        if (!(gatePx > 0 && gatePx <= 1000)) {
            throw new IllegalArgumentException("gatePx: " + gatePx + " (expected more than 0, at most 1000)");
        }
    }
}
