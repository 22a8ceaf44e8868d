package wayward.event;

import java.time.Instant;

/**
 * One phase of an event: the record that goes to the event log, standard output, webhooks and MQTT. Immutable.
 * Measured values are NaN where they do not apply (camera health events; the duration of a start).
 *
 * @param id              unique per event, shared by its start and end
 * @param camera          camera id from the config
 * @param zone            zone id, or null for camera events
 * @param phase           {@code start} or {@code end}
 * @param streamSeconds   seconds since the stream's first frame when this phase was decided
 * @param at              wall-clock time (UTC) when this phase was decided
 * @param headingDeg      measured bearing of the motion, degrees clockwise from image-up
 * @param speed           measured mean speed, analysis pixels per second
 * @param coverage        share of the zone's pixels taking part (mean over the hold time for a start, peak
 *                        over the event for an end)
 * @param durationSeconds stream seconds from start to end (end phase only)
 * @param clip            evidence clip, relative to the data folder, or null (it is complete once the post-roll
 *                        after the end has passed)
 * @param snapshot        JPEG of the triggering frame, relative to the data folder, or null
 */
public record Event(String id, String camera, String zone, EventKind kind, Phase phase, double streamSeconds,
        Instant at, double headingDeg, double speed, double coverage, double durationSeconds, String clip,
        String snapshot) {

    /** An event phase without evidence files. */
    public Event(String id, String camera, String zone, EventKind kind, Phase phase, double streamSeconds,
            Instant at, double headingDeg, double speed, double coverage, double durationSeconds) {
        this(id, camera, zone, kind, phase, streamSeconds, at, headingDeg, speed, coverage, durationSeconds, null, null);
    }

    /** The same phase naming its evidence files. */
    public Event withEvidence(String clipPath, String snapshotPath) {
        return new Event(id, camera, zone, kind, phase, streamSeconds, at, headingDeg, speed, coverage,
                durationSeconds, clipPath, snapshotPath);
    }

    /** Start or end of an event. */
    public enum Phase {
        START("start"), END("end");

        private final String jsonName;

        Phase(String jsonName) {
            this.jsonName = jsonName;
        }

        public String jsonName() {
            return jsonName;
        }
    }

    public Event {
        if (id == null || camera == null || kind == null || phase == null || at == null) {
            throw new IllegalArgumentException("event: id, camera, kind, phase and at are required");
        }
    }
}
