package wayward.delivery;

import java.util.HashMap;
import java.util.Map;
import wayward.event.Event;
import wayward.event.EventKind;

/**
 * What is open for each zone, from its phases in outbox order, so that the retained zone state shows the one that
 * matters most: {@code alert} while a wrong-way or motion event is open, else {@code muted} while a mute is, else
 * {@code off_hours} while the zone is outside its hours, else {@code clear}. An alert that ends during a mute so
 * leaves the zone muted, and a mute that ends during off hours leaves it off hours. One caller thread (the
 * courier's); allocates per phase.
 */
final class ZoneStates {
    private static final class Open {
        Event alert;
        Event mute;
        Event offHours;
        long lastSeq = Long.MIN_VALUE;
    }

    private final Map<String, Open> zones = new HashMap<>();

    /**
     * Takes a zone's phase at outbox {@code seq} and returns the retained state payload after it. A phase sent
     * again (a retry) changes nothing; an end closes only what its own start opened.
     */
    byte[] apply(long seq, Event e) {
        if (e.zone() == null) {
            throw new IllegalArgumentException("event " + e.id() + ": no zone (expected a zone's phase)");
        }
        Open open = zones.computeIfAbsent(e.camera() + "/" + e.zone(), z -> new Open());
        if (seq > open.lastSeq) {
            open.lastSeq = seq;
            boolean start = e.phase() == Event.Phase.START;
            if (e.kind() == EventKind.ZONE_MUTED) {
                open.mute = start ? e : same(open.mute, e) ? null : open.mute;
            } else if (e.kind() == EventKind.ZONE_OFF_HOURS) {
                open.offHours = start ? e : same(open.offHours, e) ? null : open.offHours;
            } else {
                open.alert = start ? e : same(open.alert, e) ? null : open.alert;
            }
        }
        Event shown = open.alert != null ? open.alert : open.mute != null ? open.mute : open.offHours;
        return shown != null ? MqttTopics.zoneStatePayload(shown) : MqttTopics.zoneStatePayload(e);
    }

    private static boolean same(Event open, Event end) {
        return open != null && open.id().equals(end.id());
    }
}
