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
 */
public record RuleSettings(double onsetLevel, double releaseLevel, double holdSeconds, double clearSeconds,
        double restSeconds) {
    public RuleSettings {
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
