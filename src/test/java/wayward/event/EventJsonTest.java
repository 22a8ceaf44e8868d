package wayward.event;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.core.JsonFactory;
import com.fasterxml.jackson.core.JsonParser;
import com.fasterxml.jackson.core.JsonToken;
import java.io.IOException;
import java.time.Instant;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import wayward.testing.SchemaCheck;

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
        assertEquals(1.0, m.get("schema"));
        assertEquals("schema", m.keySet().iterator().next(), "the version comes first");
        assertEquals("e-1", m.get("id"));
        assertEquals("yard-mast-2", m.get("camera"));
        assertEquals("lane-2-out", m.get("zone"));
        assertEquals("wrong_way", m.get("kind"));
        assertEquals("start", m.get("phase"));
        assertEquals(12.346, m.get("stream_s"));
        assertEquals("2026-12-02T10:15:30.250Z", m.get("at"));
        // a wrong_way phase's readings are of the samples moving against the heading
        assertEquals(179.9, m.get("against_bearing_deg"));
        assertEquals(45.13, m.get("against_speed_px_s"));
        assertEquals(0.0386, m.get("against_share"));
        assertFalse(m.containsKey("duration_s"), "NaN values are left out");
        assertFalse(m.containsKey("heading_deg"), "heading_deg is only the zone's permitted direction (config)");
    }

    @Test
    void eachKindWritesItsReadingsUnderItsOwnNames() throws IOException {
        Map<String, Object> motion = parse(EventJson.toJson(new Event("e-3", "c", "door", EventKind.MOTION,
                Event.Phase.START, 2, Instant.EPOCH, 90, 12.5, 0.25, Double.NaN)));
        assertEquals(90.0, motion.get("moving_bearing_deg"));
        assertEquals(12.5, motion.get("moving_speed_px_s"));
        assertEquals(0.25, motion.get("moving_share"));
        assertFalse(motion.containsKey("against_share"));
        Map<String, Object> moved = parse(EventJson.toJson(new Event("e-4", "c", null, EventKind.CAMERA_MOVED,
                Event.Phase.START, 2, Instant.EPOCH, 359.96, Double.NaN, Double.NaN, 5.657, Double.NaN, null, null,
                null, null)));
        assertEquals(0.0, moved.get("shift_bearing_deg"), "359.96° rounds to 0.0, not 360");
        assertEquals(5.7, moved.get("shift_px"));
        assertEquals(List.of("schema", "id", "camera", "kind", "phase", "stream_s", "at", "shift_bearing_deg",
                "shift_px"), List.copyOf(moved.keySet()));
    }

    @Test
    void readsRecordsWrittenBeforeTheSchemaFieldAsTheirMeaning() {
        // literal lines in the form the previous version wrote to the outbox and the event log
        Event wrongWay = read("{\"id\":\"a1\",\"camera\":\"yard-mast-2\",\"zone\":\"lane-2-out\",\"kind\":\"wrong_way\","
                + "\"phase\":\"start\",\"stream_s\":12.333,\"at\":\"2026-12-02T10:15:30.250Z\",\"heading_deg\":181.0,"
                + "\"speed\":36.27,\"coverage\":0.0556,\"clip\":\"clips/yard-mast-2/a.mp4\"}");
        assertEquals(181.0, wrongWay.bearingDeg());
        assertEquals(36.27, wrongWay.speedPxPerSecond());
        assertEquals(0.0556, wrongWay.share());
        assertEquals("{\"schema\":1,\"id\":\"a1\",\"camera\":\"yard-mast-2\",\"zone\":\"lane-2-out\",\"kind\":\"wrong_way\","
                + "\"phase\":\"start\",\"stream_s\":12.333,\"at\":\"2026-12-02T10:15:30.250Z\",\"against_share\":0.0556,"
                + "\"against_speed_px_s\":36.27,\"against_bearing_deg\":181.0,\"clip\":\"clips/yard-mast-2/a.mp4\"}",
                EventJson.toJson(wrongWay), "goes out again under the new names");
        Event motion = read("{\"id\":\"m1\",\"camera\":\"c\",\"zone\":\"door\",\"kind\":\"motion\",\"phase\":\"end\","
                + "\"stream_s\":20,\"at\":\"2026-12-02T10:15:30Z\",\"heading_deg\":90.0,\"speed\":12.0,\"coverage\":0.2,"
                + "\"duration_s\":4.5}");
        assertEquals(0.2, motion.share());
        assertTrue(EventJson.toJson(motion).contains("\"moving_share\":0.2"), EventJson.toJson(motion));
        Event back = read("{\"id\":\"o-1\",\"camera\":\"yard-mast-2\",\"kind\":\"camera_back\",\"phase\":\"end\","
                + "\"stream_s\":22.5,\"at\":\"2026-12-02T10:00:12.5Z\",\"duration_s\":12.5}");
        assertEquals(EventKind.CAMERA_LOST, back.kind(), "camera_back was the end of camera_lost");
        assertEquals(Event.Phase.END, back.phase());
        assertEquals(12.5, back.durationSeconds());
        Event moved = read("{\"id\":\"s1\",\"camera\":\"c\",\"kind\":\"camera_moved\",\"phase\":\"start\","
                + "\"stream_s\":6,\"at\":\"2026-12-02T10:00:00Z\",\"heading_deg\":270.0}");
        assertEquals(270.0, moved.bearingDeg(), "camera_moved's heading_deg was the shift's bearing");
        for (Event e : List.of(wrongWay, motion, back, moved)) {
            SchemaCheck.assertEventRecord(EventJson.toJson(e));
        }
    }

    @Test
    void refusesARecordOfANewerSchema() {
        IllegalArgumentException e = org.junit.jupiter.api.Assertions.assertThrows(IllegalArgumentException.class,
                () -> read("{\"schema\":2,\"id\":\"x\",\"camera\":\"c\",\"kind\":\"motion\",\"phase\":\"start\","
                        + "\"at\":\"2026-12-02T10:00:00Z\"}"));
        assertEquals("schema 2 (expected up to 1; written by a newer version)", e.getMessage());
    }

    private static Event read(String line) {
        return EventJson.parse(line.getBytes(java.nio.charset.StandardCharsets.UTF_8));
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
