package wayward.delivery;

import java.nio.charset.StandardCharsets;
import java.time.Instant;
import java.time.format.DateTimeFormatter;
import wayward.event.Event;
import wayward.event.EventJson;
import wayward.event.EventKind;

/**
 * The topics below the configured prefix and the JSON state each retained one carries: {@code
 * <camera>/<zone>/event} and retained {@code <camera>/<zone>/state} ({@code alert} or {@code clear});
 * {@code <camera>/event} and retained {@code <camera>/state} (camera health: {@code lost}, a tamper kind,
 * {@code watching}); retained {@code status/<client id>} ({@code online}; the will sets {@code offline}).
 */
final class MqttTopics {
    private MqttTopics() {
    }

    /** The topic of a phase's own message. */
    static String eventTopic(String prefix, Event e) {
        return prefix + "/" + e.camera() + (e.zone() != null ? "/" + e.zone() : "") + "/event";
    }

    /** The retained state topic a phase updates. */
    static String stateTopic(String prefix, String camera, String zone) {
        return prefix + "/" + camera + (zone != null ? "/" + zone : "") + "/state";
    }

    static String statusTopic(String prefix, String clientId) {
        return prefix + "/status/" + clientId;
    }

    /** The retained state a phase sets: alert/clear for zones, lost/watching for cameras. */
    static byte[] statePayload(Event e) {
        String state;
        if (e.zone() != null) {
            state = e.phase() == Event.Phase.START ? "alert" : "clear";
        } else {
            // camera_lost → lost; a tamper kind → its name (view_blocked, camera_moved, …); any end → watching
            state = e.phase() == Event.Phase.END || e.kind() == EventKind.CAMERA_BACK ? "watching"
                    : e.kind() == EventKind.CAMERA_LOST ? "lost" : e.kind().jsonName();
        }
        return json(g -> {
            g.writeStringField("state", state);
            g.writeStringField("event", e.id());
            g.writeStringField("kind", e.kind().jsonName());
            g.writeStringField("at", DateTimeFormatter.ISO_INSTANT.format(e.at()));
        });
    }

    /** A zone's state set to clear now, without an event. */
    static byte[] clearPayload() {
        return json(g -> {
            g.writeStringField("state", "clear");
            g.writeStringField("at", now());
        });
    }

    /** The client's status; {@code stamped} adds the time. */
    static byte[] statusPayload(String clientId, String state, boolean stamped) {
        return json(g -> {
            g.writeStringField("state", state);
            g.writeStringField("client", clientId);
            if (stamped) {
                g.writeStringField("at", now());
            }
        });
    }

    private static byte[] json(EventJson.Fields f) {
        return EventJson.object(f).getBytes(StandardCharsets.UTF_8);
    }

    private static String now() {
        return DateTimeFormatter.ISO_INSTANT.format(Instant.now());
    }
}
