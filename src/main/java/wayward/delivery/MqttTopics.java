package wayward.delivery;

import java.nio.charset.StandardCharsets;
import java.time.Instant;
import java.time.format.DateTimeFormatter;
import java.util.Collection;
import java.util.Set;
import wayward.event.Event;
import wayward.event.EventJson;
import wayward.event.EventKind;

/**
 * The topics below the configured prefix and the JSON each carries: {@code <camera>/<zone>/event} (the event
 * record) and retained {@code <camera>/<zone>/state} ({@code alert} or {@code clear}); {@code <camera>/event}
 * (the record) and retained {@code <camera>/state} ({@code watching} or {@code lost}, with the tamper conditions
 * open); retained {@code status/<client id>} ({@code online}; the will sets {@code offline}); retained
 * {@code mutes/<camera>[/<zone>]} (the latest mute asked of an instance, passed on to the others). The payloads are
 * fixed by the files in {@code schema/} (README, "MQTT").
 */
public final class MqttTopics {
    /** The level under the prefix that holds the service status; no camera may have it as its id. */
    public static final String STATUS_LEVEL = "status";
    /** The level under the prefix that holds the operators' commands; no camera may have it as its id. */
    public static final String COMMAND_LEVEL = "command";
    /** The level under the prefix that holds the mutes instances pass on; no camera may have it as its id. */
    public static final String MUTES_LEVEL = "mutes";
    /** Camera ids that would make a camera's topics collide with a fixed topic. */
    public static final Set<String> RESERVED_CAMERA_IDS = Set.of(STATUS_LEVEL, COMMAND_LEVEL, MUTES_LEVEL);

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
        return prefix + "/" + STATUS_LEVEL + "/" + clientId;
    }

    /** Every client's status topic (a filter with a single-level wildcard, MQTT 3.1.1 §4.7.1.3). */
    static String statusFilter(String prefix) {
        return prefix + "/" + STATUS_LEVEL + "/+";
    }

    /** The retained state a zone's phase sets: alert at its start, clear at its end. */
    static byte[] zoneStatePayload(Event e) {
        if (e.zone() == null) {
            throw new IllegalArgumentException("event " + e.id() + ": no zone (expected a zone's phase)");
        }
        boolean start = e.phase() == Event.Phase.START;
        String state = !start ? "clear" : e.kind() == EventKind.ZONE_MUTED ? "muted"
                : e.kind() == EventKind.ZONE_OFF_HOURS ? "off_hours" : "alert";
        return json(g -> {
            g.writeStringField("state", state);
            g.writeStringField("event", e.id());
            g.writeStringField("kind", e.kind().jsonName());
            if (start && e.control() != null) {
                if (e.control().until() != null) {
                    g.writeStringField("until", DateTimeFormatter.ISO_INSTANT.format(e.control().until()));
                }
                if (e.control().by() != null) {
                    g.writeStringField("by", e.control().by());
                }
                g.writeStringField("reason", e.control().reason());
            }
            g.writeStringField("at", DateTimeFormatter.ISO_INSTANT.format(e.at()));
        });
    }

    /**
     * The retained state of a camera after phase {@code e}: {@code lost} while it delivers no pictures, else
     * {@code watching}; {@code conditions} lists the tamper conditions open, in the order of {@link EventKind}
     * (empty when none is); {@code event}, {@code kind}, {@code phase} and {@code at} name the phase that set it.
     */
    static byte[] cameraStatePayload(Event e, boolean lost, Collection<EventKind> conditions) {
        return cameraStatePayload(e, lost, false, conditions);
    }

    /**
     * @param lost       the analysis stream (or the camera's one stream) is lost
     * @param sourceLost a two-stream camera's main stream ({@code source}) is lost: written as
     *                   {@code "source_lost": true}, left out otherwise
     */
    static byte[] cameraStatePayload(Event e, boolean lost, boolean sourceLost, Collection<EventKind> conditions) {
        return cameraStatePayload(e, lost, sourceLost, conditions, null);
    }

    /** @param mutedUntil while the whole camera is muted, when that ends; null otherwise */
    static byte[] cameraStatePayload(Event e, boolean lost, boolean sourceLost, Collection<EventKind> conditions,
            Instant mutedUntil) {
        return json(g -> {
            g.writeStringField("state", lost ? "lost" : "watching");
            if (sourceLost) {
                g.writeBooleanField("source_lost", true);
            }
            if (mutedUntil != null) {
                g.writeStringField("muted_until", DateTimeFormatter.ISO_INSTANT.format(mutedUntil));
            }
            g.writeArrayFieldStart("conditions");
            for (EventKind k : conditions) {
                g.writeString(k.jsonName());
            }
            g.writeEndArray();
            g.writeStringField("event", e.id());
            g.writeStringField("kind", e.kind().jsonName());
            g.writeStringField("phase", e.phase().jsonName());
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
        return statusPayload(clientId, null, state, stamped);
    }

    /** The client's status naming its instance (null: one instance watches all); {@code stamped} adds the time. */
    static byte[] statusPayload(String clientId, String instance, String state, boolean stamped) {
        return json(g -> {
            g.writeStringField("state", state);
            g.writeStringField("client", clientId);
            if (instance != null) {
                g.writeStringField("instance", instance);
            }
            if (stamped) {
                g.writeStringField("at", now());
            }
        });
    }

    /** The retained record of a camera's or zone's latest mute passed on between instances. */
    static String muteTopic(String prefix, String camera, String zone) {
        return prefix + "/" + MUTES_LEVEL + "/" + camera + (zone != null ? "/" + zone : "");
    }

    /** Every mute record (a multi-level wildcard, MQTT 3.1.1 §4.7.1.2). */
    static String muteFilter(String prefix) {
        return prefix + "/" + MUTES_LEVEL + "/#";
    }

    /** Whether {@code topic} is a mute record's. */
    static boolean isMute(String prefix, String topic) {
        return topic.startsWith(prefix + "/" + MUTES_LEVEL + "/");
    }

    /** Every operator's commands: {@code <prefix>/command/<user>/<verb>}. */
    static String commandFilter(String prefix) {
        return prefix + "/" + COMMAND_LEVEL + "/+/+";
    }

    /** {@code [user, verb]} of a command topic below {@code prefix}, or null for another topic. */
    static String[] command(String prefix, String topic) {
        String head = prefix + "/" + COMMAND_LEVEL + "/";
        if (!topic.startsWith(head)) {
            return null;
        }
        String[] rest = topic.substring(head.length()).split("/", -1);
        return rest.length == 2 && !rest[0].isEmpty() && !rest[1].isEmpty() ? rest : null;
    }

    /** What another instance's status says: its name and whether it is online. */
    record PeerStatus(String instance, boolean online) {
    }

    /**
     * Reads a status payload ({@link #statusPayload}); null when it names no instance or is not a status (a
     * client of an older version, or something else published there).
     */
    static PeerStatus parseStatus(byte[] payload) {
        try (com.fasterxml.jackson.core.JsonParser p = new com.fasterxml.jackson.core.JsonFactory()
                .createParser(payload)) {
            if (p.nextToken() != com.fasterxml.jackson.core.JsonToken.START_OBJECT) {
                return null;
            }
            String state = null;
            String instance = null;
            while (p.nextToken() == com.fasterxml.jackson.core.JsonToken.FIELD_NAME) {
                String field = p.currentName();
                p.nextToken();
                switch (field) {
                    case "state" -> state = p.getValueAsString();
                    case "instance" -> instance = p.getValueAsString();
                    default -> p.skipChildren();
                }
            }
            if (instance == null || !("online".equals(state) || "offline".equals(state))) {
                return null;
            }
            return new PeerStatus(instance, "online".equals(state));
        } catch (java.io.IOException e) {
            return null;
        }
    }

    private static byte[] json(EventJson.Fields f) {
        return EventJson.object(f).getBytes(StandardCharsets.UTF_8);
    }

    private static String now() {
        return DateTimeFormatter.ISO_INSTANT.format(Instant.now());
    }
}
