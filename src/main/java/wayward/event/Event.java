package wayward.event;

import java.time.Instant;

/**
 * One phase of an event: the record that goes to the event log, standard output, webhooks and MQTT. Immutable.
 * Measured values are NaN where they do not apply (camera health events; the duration of a start). The measured
 * values keep one meaning each in JSON by taking their name from the kind ({@link EventJson}): {@code wrong_way}
 * writes them as {@code against_share}, {@code against_speed_px_s}, {@code against_bearing_deg} (the samples moving
 * against the heading); {@code motion} as {@code moving_share}, {@code moving_speed_px_s},
 * {@code moving_bearing_deg} (the samples moving at all); {@code camera_moved} as {@code shift_bearing_deg} and
 * {@code shift_px}; other kinds carry none of them.
 *
 * @param id              unique per event, shared by its start and end
 * @param camera          camera id from the config
 * @param zone            zone id, or null for camera events
 * @param phase           {@code start} or {@code end}
 * @param streamSeconds   seconds since the stream's first frame when this phase was decided
 * @param at              wall-clock time (UTC) when this phase was decided
 * @param bearingDeg      measured bearing of the motion (camera_moved: of the picture's shift), degrees clockwise
 *                        from image-up; never the zone's permitted heading
 * @param speedPxPerSecond measured mean speed of the samples taking part, analysis pixels per second
 * @param share           share of the zone's samples taking part, 0..1 (wrong_way: moving against the heading,
 *                        motion: moving at all; mean over the hold time for a start, peak over the event for an end)
 * @param shiftPx         camera_moved: length of the picture's shift, analysis pixels
 * @param durationSeconds stream seconds from start to end (end phase only)
 * @param clip            evidence clip, relative to the data folder, or null (it is complete once the post-roll
 *                        after the end has passed)
 * @param snapshot        JPEG of the triggering frame, relative to the data folder, or null
 * @param mover           the mover that decided a {@code wrong_way} event, or null (other kinds)
 * @param endedBy         for an end phase not decided by the rules, why it ended: {@link #SERVICE_STOPPED} for an
 *                        event the service closed at its next start because it had stopped (or crashed) while the
 *                        event was open; null otherwise
 * @param stream          for a camera with two streams ({@code analysis_source} set), which one, named by its
 *                        config key ({@link #SOURCE} or {@link #ANALYSIS_SOURCE}): for {@code camera_lost} the stream
 *                        that dropped (JSON {@code stream}), for zone events the stream the clip was copied from
 *                        (JSON {@code evidence_stream}); null for a camera with one stream
 * @param handover        for {@code camera_reassigned}, which instance watched the camera and which watches it now;
 *                        null for other kinds
 * @param control         for {@code zone_muted}, {@code camera_muted} and {@code zone_off_hours}: until when, by
 *                        whom and why; null for other kinds
 */
public record Event(String id, String camera, String zone, EventKind kind, Phase phase, double streamSeconds,
        Instant at, double bearingDeg, double speedPxPerSecond, double share, double shiftPx, double durationSeconds,
        String clip, String snapshot, Mover mover, String endedBy, String stream, Handover handover, Control control) {
    /** {@link #stream}: the camera's main stream, config key {@code source}. */
    public static final String SOURCE = "source";
    /** {@link #stream}: the camera's analysis stream, config key {@code analysis_source}. */
    public static final String ANALYSIS_SOURCE = "analysis_source";
    /** {@link #endedBy} of an event closed at a start because the service had stopped while it was open. */
    public static final String SERVICE_STOPPED = "service_stopped";
    /** {@link #endedBy} of a mute that reached its end time by itself. */
    public static final String EXPIRED = "expired";

    /**
     * An operator's or a schedule's control of a zone or camera: a mute, or the hours when a zone's rule applies.
     *
     * @param until  a mute's start: when it ends by itself; {@code zone_off_hours}: when the zone's hours begin
     *               again (start) or end next (end); null when there is no such time
     * @param by     who: the status server's token name or the MQTT client id; null for the schedule and for a
     *               mute that expired
     * @param reason why, in the operator's words or the schedule's (JSON {@code reason}); may be empty
     */
    public record Control(Instant until, String by, String reason) {
        public Control {
            if (reason == null) {
                throw new IllegalArgumentException("control: reason is required (may be empty)");
            }
        }
    }

    /**
     * The mover that went the wrong way, as followed by the zone's tracker (analysis pixels).
     *
     * @param widthPx          width of its moving samples' box, analysis pixels (at the start: in the deciding
     *                         frame; at the end: the last frame it was seen)
     * @param heightPx         height of that box, analysis pixels
     * @param samples          most moving flow samples it had in one frame
     * @param path             its centroid's path, picture fractions 0..1, x and y interleaved, first point where
     *                         it was first seen, last point its latest position; a few points
     * @param speedPxPerSecond its mean speed while followed, analysis pixels per second
     * @param travelPx         how far it has travelled against the heading, analysis pixels
     */
    public record Mover(int widthPx, int heightPx, int samples, double[] path, double speedPxPerSecond,
            double travelPx) {
        public Mover {
            if (path == null || path.length % 2 != 0) {
                throw new IllegalArgumentException("path: expected x, y pairs");
            }
            path = path.clone();
        }

        @Override
        public double[] path() {
            return path.clone();
        }

        @Override
        public boolean equals(Object o) {
            return o instanceof Mover m && m.widthPx == widthPx && m.heightPx == heightPx && m.samples == samples
                    && java.util.Arrays.equals(m.path, path) && Double.compare(m.speedPxPerSecond, speedPxPerSecond) == 0
                    && Double.compare(m.travelPx, travelPx) == 0;
        }

        @Override
        public int hashCode() {
            return java.util.Objects.hash(widthPx, heightPx, samples, java.util.Arrays.hashCode(path),
                    speedPxPerSecond, travelPx);
        }

        @Override
        public String toString() {
            return "Mover[" + widthPx + "x" + heightPx + " px, " + samples + " samples, path "
                    + java.util.Arrays.toString(path) + ", " + speedPxPerSecond + " px/s, travel " + travelPx + " px]";
        }

        /** Points in the path. */
        public int points() {
            return path.length / 2;
        }
    }

    /**
     * A camera moved between instances sharing one config ({@code camera_reassigned}).
     *
     * @param from   the instance that watched it
     * @param to     the instance that watches it now
     * @param reason why, in a few words (JSON {@code reason}), e.g. "south went offline"
     */
    public record Handover(String from, String to, String reason) {
        public Handover {
            if (from == null || to == null || reason == null) {
                throw new IllegalArgumentException("handover: from, to and reason are required");
            }
        }
    }

    /** An event phase of a camera with one stream, or of one of its streams. */
    public Event(String id, String camera, String zone, EventKind kind, Phase phase, double streamSeconds,
            Instant at, double bearingDeg, double speedPxPerSecond, double share, double shiftPx,
            double durationSeconds, String clip, String snapshot, Mover mover, String endedBy, String stream) {
        this(id, camera, zone, kind, phase, streamSeconds, at, bearingDeg, speedPxPerSecond, share, shiftPx,
                durationSeconds, clip, snapshot, mover, endedBy, stream, null, null);
    }

    /** An event phase of a camera moved between instances ({@link #handover}). */
    public Event(String id, String camera, String zone, EventKind kind, Phase phase, double streamSeconds,
            Instant at, double bearingDeg, double speedPxPerSecond, double share, double shiftPx,
            double durationSeconds, String clip, String snapshot, Mover mover, String endedBy, String stream,
            Handover handover) {
        this(id, camera, zone, kind, phase, streamSeconds, at, bearingDeg, speedPxPerSecond, share, shiftPx,
                durationSeconds, clip, snapshot, mover, endedBy, stream, handover, null);
    }

    /**
     * A phase of a mute or of a zone's hours ({@code zone_muted}, {@code camera_muted}, {@code zone_off_hours}):
     * {@code zone} null for a camera's mute; {@code endedBy} {@link #EXPIRED} for a mute's end that came by itself.
     */
    public static Event control(String id, String camera, String zone, EventKind kind, Phase phase, Instant at,
            double durationSeconds, String endedBy, Control control) {
        return new Event(id, camera, zone, kind, phase, 0, at, Double.NaN, Double.NaN, Double.NaN, Double.NaN,
                phase == Phase.END ? durationSeconds : Double.NaN, null, null, null, endedBy, null, null, control);
    }

    /** A phase of {@code camera_reassigned}: {@code camera} moved as {@code handover} says, at {@code at}. */
    public static Event handover(String id, String camera, Phase phase, Instant at, Handover handover) {
        return new Event(id, camera, null, EventKind.CAMERA_REASSIGNED, phase, 0, at, Double.NaN, Double.NaN,
                Double.NaN, Double.NaN, phase == Phase.END ? 0 : Double.NaN, null, null, null, null, null, handover);
    }

    /** An event phase of a camera with one stream. */
    public Event(String id, String camera, String zone, EventKind kind, Phase phase, double streamSeconds,
            Instant at, double bearingDeg, double speedPxPerSecond, double share, double shiftPx,
            double durationSeconds, String clip, String snapshot, Mover mover, String endedBy) {
        this(id, camera, zone, kind, phase, streamSeconds, at, bearingDeg, speedPxPerSecond, share, shiftPx,
                durationSeconds, clip, snapshot, mover, endedBy, null);
    }

    /** An event phase as the rules decide it. */
    public Event(String id, String camera, String zone, EventKind kind, Phase phase, double streamSeconds,
            Instant at, double bearingDeg, double speedPxPerSecond, double share, double durationSeconds, String clip,
            String snapshot, Mover mover) {
        this(id, camera, zone, kind, phase, streamSeconds, at, bearingDeg, speedPxPerSecond, share, Double.NaN,
                durationSeconds, clip, snapshot, mover, null);
    }

    /** The end phase of this started event, closed at {@code now} because the service stopped while it was open. */
    public Event closedAtRestart(Instant now) {
        return new Event(id, camera, zone, kind, Phase.END, Double.NaN, now, Double.NaN, Double.NaN, Double.NaN,
                Double.NaN, Double.NaN, null, null, null, SERVICE_STOPPED, stream, handover, control);
    }

    /** An event phase with evidence files and no mover. */
    public Event(String id, String camera, String zone, EventKind kind, Phase phase, double streamSeconds,
            Instant at, double bearingDeg, double speedPxPerSecond, double share, double durationSeconds, String clip,
            String snapshot) {
        this(id, camera, zone, kind, phase, streamSeconds, at, bearingDeg, speedPxPerSecond, share, durationSeconds,
                clip, snapshot, null);
    }

    /** An event phase without evidence files. */
    public Event(String id, String camera, String zone, EventKind kind, Phase phase, double streamSeconds,
            Instant at, double bearingDeg, double speedPxPerSecond, double share, double durationSeconds) {
        this(id, camera, zone, kind, phase, streamSeconds, at, bearingDeg, speedPxPerSecond, share, durationSeconds,
                null, null);
    }

    /** The same phase naming its evidence files. */
    public Event withEvidence(String clipPath, String snapshotPath) {
        return new Event(id, camera, zone, kind, phase, streamSeconds, at, bearingDeg, speedPxPerSecond, share,
                shiftPx, durationSeconds, clipPath, snapshotPath, mover, endedBy, stream, handover, control);
    }

    /** The same phase naming the stream ({@link #SOURCE} or {@link #ANALYSIS_SOURCE}; null for none). */
    public Event withStream(String streamKey) {
        return new Event(id, camera, zone, kind, phase, streamSeconds, at, bearingDeg, speedPxPerSecond, share,
                shiftPx, durationSeconds, clip, snapshot, mover, endedBy, streamKey, handover, control);
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
        // each measured value has a JSON name only for the kinds it means something for (EventJson)
        boolean zoneKind = kind == EventKind.WRONG_WAY || kind == EventKind.MOTION;
        if (!zoneKind && (present(speedPxPerSecond) || present(share))) {
            throw new IllegalArgumentException("event " + kind.jsonName() + ": speed and share (expected only for "
                    + "wrong_way and motion)");
        }
        if (!zoneKind && kind != EventKind.CAMERA_MOVED && present(bearingDeg)) {
            throw new IllegalArgumentException("event " + kind.jsonName() + ": bearing " + bearingDeg
                    + " (expected only for wrong_way, motion and camera_moved)");
        }
        if (stream != null && !stream.equals(SOURCE) && !stream.equals(ANALYSIS_SOURCE)) {
            throw new IllegalArgumentException("event stream: " + stream + " (expected " + SOURCE + " or "
                    + ANALYSIS_SOURCE + ")");
        }
        boolean controlKind = kind == EventKind.ZONE_MUTED || kind == EventKind.CAMERA_MUTED
                || kind == EventKind.ZONE_OFF_HOURS;
        if (controlKind != (control != null)) {
            throw new IllegalArgumentException("event " + kind.jsonName() + ": control " + control
                    + " (expected one exactly for zone_muted, camera_muted and zone_off_hours)");
        }
        if (((kind == EventKind.ZONE_MUTED || kind == EventKind.ZONE_OFF_HOURS) && zone == null)
                || (kind == EventKind.CAMERA_MUTED && zone != null)) {
            throw new IllegalArgumentException("event " + kind.jsonName() + ": zone " + zone
                    + " (expected one for zone_muted and zone_off_hours, none for camera_muted)");
        }
        if ((kind == EventKind.CAMERA_REASSIGNED) != (handover != null)) {
            throw new IllegalArgumentException("event " + kind.jsonName() + ": handover " + handover
                    + " (expected one exactly for camera_reassigned)");
        }
        if (kind != EventKind.CAMERA_MOVED && present(shiftPx)) {
            throw new IllegalArgumentException("event " + kind.jsonName() + ": shift " + shiftPx
                    + " px (expected only for camera_moved)");
        }
    }

    private static boolean present(double v) {
        return !Double.isNaN(v);
    }
}
