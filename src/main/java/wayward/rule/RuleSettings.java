package wayward.rule;

/**
 * Hysteresis levels and times of a zone rule. Levels are shares of the zone's pixels (0..1); times are stream
 * seconds.
 *
 * @param onsetLevel    level the signal must reach for an event to begin
 * @param releaseLevel  lower level; below it the condition counts as absent (at most onsetLevel)
 * @param holdSeconds   how long the condition must hold before the event starts
 * @param clearSeconds  how long it must stay absent before the event ends
 * @param restSeconds   how long after an end the zone may not start again
 * @param minTravelPx   wrong-way zones: how far (analysis pixels) the movement against the heading must have
 *                      carried, besides holding for holdSeconds; swaying things go back and forth and never
 *                      carry far
 * @param quickTravelPx wrong-way zones: this much travel starts the event before holdSeconds have passed, so a
 *                      fast mover that crosses the zone in less than the hold time is not missed
 */
public record RuleSettings(double onsetLevel, double releaseLevel, double holdSeconds, double clearSeconds,
        double restSeconds, double minTravelPx, double quickTravelPx) {
    /** Levels and times only: no travel conditions. */
    public RuleSettings(double onsetLevel, double releaseLevel, double holdSeconds, double clearSeconds,
            double restSeconds) {
        this(onsetLevel, releaseLevel, holdSeconds, clearSeconds, restSeconds, 0, Double.POSITIVE_INFINITY);
    }

    public RuleSettings {
        if (!(minTravelPx >= 0) || !(quickTravelPx > 0)) {
            throw new IllegalArgumentException("minTravelPx/quickTravelPx: " + minTravelPx + "/" + quickTravelPx
                    + " (expected 0 or more / more than 0)");
        }
        if (!(onsetLevel > 0 && onsetLevel <= 1)) {
            throw new IllegalArgumentException("onsetLevel: " + onsetLevel + " (expected more than 0, at most 1)");
        }
        if (!(releaseLevel >= 0 && releaseLevel <= onsetLevel)) {
            throw new IllegalArgumentException("releaseLevel: " + releaseLevel + " (expected 0 to onsetLevel " + onsetLevel + ")");
        }
        if (!(holdSeconds >= 0) || !(clearSeconds >= 0) || !(restSeconds >= 0)) {
            throw new IllegalArgumentException("hold/clear/rest: " + holdSeconds + "/" + clearSeconds + "/" + restSeconds
                    + " (expected 0 or more seconds)");
        }
    }
}
