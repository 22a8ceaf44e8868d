package wayward.clip;

/**
 * The {@code [clips]} table: evidence clips by stream copy and snapshots for every motion event.
 *
 * @param enabled         write clips and snapshots at all
 * @param preRollSeconds  video kept from before the event's start (from the keyframe at or before it)
 * @param postRollSeconds video kept after the event's end
 * @param maxSeconds      longest part of a clip: a longer event's clip is closed at the next keyframe after it
 *                        and goes on in a further part file (-part2.mp4, …) until the post-roll
 * @param keepDays        evidence older than this is deleted
 * @param keepGigabytes   the evidence folder is kept below this size, oldest events deleted first
 */
public record ClipConfig(boolean enabled, double preRollSeconds, double postRollSeconds, double maxSeconds,
        double keepDays, double keepGigabytes) {
    public static final ClipConfig DEFAULTS = new ClipConfig(true, 3, 4, 120, 30, 20);
}
