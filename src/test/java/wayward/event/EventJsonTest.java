package wayward.event;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;

import com.fasterxml.jackson.core.JsonFactory;
import com.fasterxml.jackson.core.JsonParser;
import com.fasterxml.jackson.core.JsonToken;
import java.io.IOException;
import java.time.Instant;
import java.util.LinkedHashMap;
import java.util.Map;
import org.junit.jupiter.api.Test;

class EventJsonTest {
    static Map<String, Object> parse(String json) throws IOException {
        Map<String, Object> m = new LinkedHashMap<>();
        try (JsonParser p = new JsonFactory().createParser(json)) {
            assertEquals(JsonToken.START_OBJECT, p.nextToken());
            while (p.nextToken() == JsonToken.FIELD_NAME) {
                String name = p.currentName();
                JsonToken t = p.nextToken();
                m.put(name, t == JsonToken.VALUE_STRING ? p.getText() : p.getDoubleValue());
            }
        }
        return m;
    }

    @Test
    void startPhaseCarriesTheContractFields() throws IOException {
        Event e = new Event("e-1", "yard-mast-2", "lane-2-out", EventKind.WRONG_WAY, Event.Phase.START, 12.3456,
                Instant.parse("2026-12-02T10:15:30.250Z"), 179.94, 45.126, 0.03861, Double.NaN);
        String json = EventJson.toJson(e);
        assertFalse(json.contains("\n"), "one line");
        Map<String, Object> m = parse(json);
        // field names fixed by the event record contract (DESIGN.md)
        assertEquals("e-1", m.get("id"));
        assertEquals("yard-mast-2", m.get("camera"));
        assertEquals("lane-2-out", m.get("zone"));
        assertEquals("wrong_way", m.get("kind"));
        assertEquals("start", m.get("phase"));
        assertEquals(12.346, m.get("stream_s"));
        assertEquals("2026-12-02T10:15:30.250Z", m.get("at"));
        assertEquals(179.9, m.get("heading_deg"));
        assertEquals(45.13, m.get("speed"));
        assertEquals(0.0386, m.get("coverage"));
        assertFalse(m.containsKey("duration_s"), "NaN values are left out");
    }

    @Test
    void readsBackWhatItWroteSoTheOutboxCanHoldTheJson() {
        Event e = new Event("e-2", "yard-mast-2", "lane-2-out", EventKind.WRONG_WAY, Event.Phase.END, 16.8,
                Instant.parse("2026-12-02T10:15:34.750Z"), 181.2, 40.5, 0.061, 4.5, "clips/a.mp4", "clips/a.jpg");
        String json = EventJson.toJson(e);
        Event back = EventJson.parse(json.getBytes(java.nio.charset.StandardCharsets.UTF_8));
        assertEquals(e, back);
        assertEquals(json, EventJson.toJson(back), "the same bytes go out again");
        Event camera = new Event("o-1", "yard-mast-2", null, EventKind.CAMERA_LOST, Event.Phase.START, 3,
                Instant.parse("2026-12-02T10:00:00Z"), Double.NaN, Double.NaN, Double.NaN, Double.NaN);
        assertEquals(EventJson.toJson(camera),
                EventJson.toJson(EventJson.parse(EventJson.toJson(camera).getBytes(java.nio.charset.StandardCharsets.UTF_8))));
    }

    @Test
    void refusesWhatIsNotAnEventPhase() {
        for (String bad : new String[] {"[]", "{\"id\":\"x\"}", "{\"id\":\"x\",\"camera\":\"c\",\"kind\":\"nope\"}", "{"}) {
            org.junit.jupiter.api.Assertions.assertThrows(IllegalArgumentException.class,
                    () -> EventJson.parse(bad.getBytes(java.nio.charset.StandardCharsets.UTF_8)), bad);
        }
    }
}
