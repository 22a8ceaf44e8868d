package wayward.rule;

/**
 * When a mover going against a zone's heading raises a {@code wrong_way} event ({@link WrongWayRule}). Lengths
 * are analysis pixels, times stream seconds. None of them depends on how large the zone is drawn.
 *
 * @param holdSeconds    a mover must have been followed this long (and have travelled minTravelPx) to start
 *                       an event
 * @param clearSeconds   an event ends when none of its movers has been seen for this long
 * @param restSeconds    after an end, the mover of that event (also when it is picked up again as a new track
 *                       where it was lost) may not start another event for this long; a different mover may
 *                       start one at once
 * @param minTravelPx    travel against the heading a mover needs, with holdSeconds; swaying things go back and
 *                       forth and never carry far (a steady mover needs 0.4 of it after two holds,
 *                       {@link WrongWayRule})
 * @param quickTravelPx  a mover that travelled this far against the heading starts the event whatever its age
 *                       (seen in two frames at least), so a fast mover crossing in under the hold time is not
 *                       missed; at least minTravelPx
 * @param minMoverAreaPx smallest mover that counts: its most moving samples in one frame × the sample spacing²,
 *                       analysis pixels² (so it means the same at any sample spacing)
 */
public record MoverRuleSettings(double holdSeconds, double clearSeconds, double restSeconds, double minTravelPx,
        double quickTravelPx, double minMoverAreaPx) {
    /** Defaults (chosen on the tune half of the detection suite; DEVELOPERS.md). */
    public static final double DEFAULT_HOLD_SECONDS = 0.5;
    public static final double DEFAULT_CLEAR_SECONDS = 1.0;
    public static final double DEFAULT_REST_SECONDS = 2.0;
    public static final double DEFAULT_MIN_TRAVEL_PX = 20;
    public static final double DEFAULT_QUICK_TRAVEL_PX = 30;
    public static final double DEFAULT_MIN_MOVER_AREA_PX = 48;

    /** The defaults. */
    public static MoverRuleSettings defaults() {
        return new MoverRuleSettings(DEFAULT_HOLD_SECONDS, DEFAULT_CLEAR_SECONDS, DEFAULT_REST_SECONDS,
                DEFAULT_MIN_TRAVEL_PX, DEFAULT_QUICK_TRAVEL_PX, DEFAULT_MIN_MOVER_AREA_PX);
    }

    public MoverRuleSettings {
        if (!(holdSeconds >= 0) || !(clearSeconds >= 0) || !(restSeconds >= 0)) {
            throw new IllegalArgumentException("hold/clear/rest: " + holdSeconds + "/" + clearSeconds + "/"
                    + restSeconds + " (expected 0 or more seconds)");
        }
        if (!(minTravelPx > 0)) {
            throw new IllegalArgumentException("minTravelPx: " + minTravelPx + " (expected more than 0)");
        }
        if (!(quickTravelPx >= minTravelPx)) {
            throw new IllegalArgumentException("quickTravelPx: " + quickTravelPx + " (expected at least minTravelPx "
                    + minTravelPx + ")");
        }
        if (!(minMoverAreaPx >= 0)) {
            throw new IllegalArgumentException("minMoverAreaPx: " + minMoverAreaPx + " (expected 0 or more)");
        }
    }
}
