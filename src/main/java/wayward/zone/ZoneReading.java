package wayward.zone;

/**
 * One frame's measurement of one zone. A mutable holder, refilled by {@link ZoneMeter#measure} every frame and
 * read by the rule on the same thread. Speeds are in analysis pixels per second; bearings in degrees clockwise
 * from image-up (0 = up, 90 = right, 180 = down, 270 = left).
 */
public final class ZoneReading {
    /** Histogram bins of moving pixels' bearings; bin k covers [k·22.5° − 11.25°, k·22.5° + 11.25°). */
    public static final int DIRECTION_BINS = 16;

    /** Stream time of the later frame of the pair, seconds. */
    public double streamSeconds;
    /** Share of the zone's pixels that are confident and move faster than the zone's minimum speed (0..1). */
    public double movingShare;
    /** Share of the zone's pixels that move against the heading (0..1); 0 for a zone without heading. */
    public double againstShare;
    /** Share of the moving pixels that move against the heading (0..1). */
    public double againstOfMoving;
    /** Mean speed of the moving pixels, px/s. */
    public double movingSpeedPxPerSecond;
    /** Bearing of the mean motion vector of the moving pixels, degrees; NaN when nothing moves. */
    public double movingBearingDeg;
    /** Mean speed of the pixels moving against the heading, px/s. */
    public double againstSpeedPxPerSecond;
    /** Bearing of the mean motion vector of the pixels moving against the heading; NaN when none. */
    public double againstBearingDeg;
    /** The picture's dominant motion (camera shake) in this frame pair, analysis pixels per frame pair. */
    public double cameraU;
    public double cameraV;
    /** Moving pixels per bearing bin. */
    public final int[] directions = new int[DIRECTION_BINS];

    public void copyFrom(ZoneReading o) {
        streamSeconds = o.streamSeconds;
        movingShare = o.movingShare;
        againstShare = o.againstShare;
        againstOfMoving = o.againstOfMoving;
        movingSpeedPxPerSecond = o.movingSpeedPxPerSecond;
        movingBearingDeg = o.movingBearingDeg;
        againstSpeedPxPerSecond = o.againstSpeedPxPerSecond;
        againstBearingDeg = o.againstBearingDeg;
        cameraU = o.cameraU;
        cameraV = o.cameraV;
        System.arraycopy(o.directions, 0, directions, 0, DIRECTION_BINS);
    }
}
