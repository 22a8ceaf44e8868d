package wayward.delivery;

import static org.junit.jupiter.api.Assertions.assertEquals;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.time.Instant;
import org.junit.jupiter.api.Test;
import wayward.event.Event;
import wayward.event.EventKind;
import wayward.testing.SchemaCheck;

/**
 * The retained zone state when an alert, a mute and the zone's hours overlap: the alert shows while open, then the
 * mute, then the off hours; each payload fits the shipped schema (mqtt-zone-state).
 */
class ZoneStatesTest {
    private static final ObjectMapper JSON = new ObjectMapper();
    private static final Instant AT = Instant.parse("2026-12-03T08:00:00Z");
    private final ZoneStates states = new ZoneStates();
    private long seq;

    private String after(Event e) throws IOException {
        String text = new String(states.apply(seq++, e), StandardCharsets.UTF_8);
        SchemaCheck.assertValid(SchemaCheck.ZONE_STATE, text);
        JsonNode n = JSON.readTree(text);
        return n.get("state").asText() + (n.has("until") ? " until " + n.get("until").asText() : "");
    }

    private static Event alert(String id, Event.Phase phase) {
        return new Event(id, "gate", "lane", EventKind.WRONG_WAY, phase, 1, AT, 10, 20, 0.1, Double.NaN);
    }

    private static Event control(String id, EventKind kind, Event.Phase phase, Instant until) {
        return Event.control(id, "gate", "lane", kind, phase, AT, phase == Event.Phase.END ? 60 : Double.NaN,
                null, new Event.Control(phase == Event.Phase.START ? until : null,
                        kind == EventKind.ZONE_MUTED ? "control-room" : null, "sweeper"));
    }

    @Test
    void anAlertShowsOverAMuteAndAMuteOverTheOffHours() throws IOException {
        Instant muteEnd = AT.plusSeconds(1800);
        Instant hoursBack = AT.plusSeconds(7200);
        assertEquals("off_hours until 2026-12-03T10:00:00Z",
                after(control("h", EventKind.ZONE_OFF_HOURS, Event.Phase.START, hoursBack)));
        assertEquals("alert", after(alert("a", Event.Phase.START)), "an event open before the hours ended");
        assertEquals("alert", after(control("m", EventKind.ZONE_MUTED, Event.Phase.START, muteEnd)));
        // before: the alert's end set the zone to clear while it was muted and off hours
        assertEquals("muted until 2026-12-03T08:30:00Z", after(alert("a", Event.Phase.END)));
        assertEquals("muted until 2026-12-03T08:30:00Z", after(alert("a", Event.Phase.END)), "a repeat");
        assertEquals("off_hours until 2026-12-03T10:00:00Z",
                after(control("m", EventKind.ZONE_MUTED, Event.Phase.END, null)));
        assertEquals("clear", after(control("h", EventKind.ZONE_OFF_HOURS, Event.Phase.END, null)));
    }
}
