package wayward.delivery;

import java.util.EnumMap;
import java.util.HashMap;
import java.util.Map;
import wayward.event.Event;
import wayward.event.EventKind;

/**
 * What is open for each camera, from its health and tamper phases in outbox order, so that the retained camera
 * state shows every open condition: the end of one tamper condition leaves the others listed, and the end of a
 * lost camera leaves the conditions that were open before. A two-stream camera whose main stream
 * ({@code source}) is lost still watches (its analysis stream delivers): the state says so apart. One caller thread (the courier's); allocates per phase.
 */
final class CameraStates {
    private static final class Open {
        /** The open camera_lost of the camera's one stream, or of its analysis stream (two streams). */
        String lostEvent;
        /** The open camera_lost of a two-stream camera's main stream ({@code source}): clips degrade, analysis goes on. */
        String sourceLostEvent;
        final EnumMap<EventKind, String> conditions = new EnumMap<>(EventKind.class);
        /** The open camera_muted and when it ends by itself. */
        String muteEvent;
        java.time.Instant mutedUntil;
        long lastSeq = Long.MIN_VALUE;
    }

    private final Map<String, Open> cameras = new HashMap<>();

    /**
     * Takes a camera phase (no zone) at outbox {@code seq} and returns the retained state payload after it. A
     * phase sent again (a retry, seq not above the last taken) changes nothing and gets the current state. An end
     * closes what its start opened (same id); an end whose start this run never saw changes nothing.
     */
    byte[] apply(long seq, Event e) {
        if (e.zone() != null) {
            throw new IllegalArgumentException("event " + e.id() + ": zone " + e.zone() + " (expected a camera phase)");
        }
        Open open = cameras.computeIfAbsent(e.camera(), c -> new Open());
        if (seq > open.lastSeq) {
            open.lastSeq = seq;
            boolean start = e.phase() == Event.Phase.START;
            if (e.kind() == EventKind.CAMERA_LOST && Event.SOURCE.equals(e.stream())) {
                if (start) {
                    open.sourceLostEvent = e.id();
                } else if (e.id().equals(open.sourceLostEvent)) {
                    open.sourceLostEvent = null;
                }
            } else if (e.kind() == EventKind.CAMERA_LOST) {
                if (start) {
                    open.lostEvent = e.id();
                } else if (e.id().equals(open.lostEvent)) {
                    open.lostEvent = null;
                }
            } else if (e.kind() == EventKind.CAMERA_MUTED) {
                if (start) {
                    open.muteEvent = e.id();
                    open.mutedUntil = e.control().until();
                } else if (e.id().equals(open.muteEvent)) {
                    open.muteEvent = null;
                    open.mutedUntil = null;
                }
            } else if (e.kind() == EventKind.CAMERA_REASSIGNED) {
                // which instance watches is no condition of the camera: the state stays as it was
                open.lastSeq = seq;
            } else if (start) {
                open.conditions.put(e.kind(), e.id());
            } else if (e.id().equals(open.conditions.get(e.kind()))) {
                open.conditions.remove(e.kind());
            }
        }
        return MqttTopics.cameraStatePayload(e, open.lostEvent != null, open.sourceLostEvent != null,
                open.conditions.keySet(), open.mutedUntil);
    }
}
