package wayward.event;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.io.InputStream;
import java.time.Instant;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;

/**
 * Holds the JSON form of event phases to the JSON Schema in the repository
 * (src/main/resources/wayward/event/event.schema.json, JSON Schema 2020-12): every field written is declared
 * there, required fields are present, and values have the declared type, range and shape. The checker below
 * covers the keywords that schema uses (type, enum, minimum, maximum, exclusiveMaximum, minItems, maxItems,
 * items, required); it is not a general validator.
 */
class EventSchemaTest {
    private static final ObjectMapper JSON = new ObjectMapper();

    static JsonNode schema() throws IOException {
        try (InputStream in = EventSchemaTest.class.getResourceAsStream("/wayward/event/event.schema.json")) {
            assertNotNull(in, "the schema is on the class path");
            return JSON.readTree(in);
        }
    }

    static List<String> problems(JsonNode schema, JsonNode record) {
        List<String> out = new ArrayList<>();
        for (JsonNode r : schema.get("required")) {
            if (!record.has(r.asText())) {
                out.add("missing " + r.asText());
            }
        }
        JsonNode props = schema.get("properties");
        for (Iterator<Map.Entry<String, JsonNode>> it = record.fields(); it.hasNext(); ) {
            Map.Entry<String, JsonNode> f = it.next();
            JsonNode s = props.get(f.getKey());
            if (s == null) {
                out.add(f.getKey() + ": not declared in the schema");
                continue;
            }
            check(f.getKey(), s, f.getValue(), out);
        }
        return out;
    }

    private static void check(String where, JsonNode s, JsonNode v, List<String> out) {
        if (s.has("enum")) {
            boolean found = false;
            for (JsonNode e : s.get("enum")) {
                found |= e.equals(v);
            }
            if (!found) {
                out.add(where + ": " + v + " not one of " + s.get("enum"));
            }
        }
        String type = s.has("type") ? s.get("type").asText() : null;
        if (("string".equals(type) && !v.isTextual())
                || ("number".equals(type) && !v.isNumber())
                || ("integer".equals(type) && !v.canConvertToExactIntegral())
                || ("array".equals(type) && !v.isArray())) {
            out.add(where + ": " + v + " is not of type " + type);
            return;
        }
        if (v.isNumber()) {
            double d = v.asDouble();
            if ((s.has("minimum") && d < s.get("minimum").asDouble())
                    || (s.has("maximum") && d > s.get("maximum").asDouble())
                    || (s.has("exclusiveMaximum") && d >= s.get("exclusiveMaximum").asDouble())) {
                out.add(where + ": " + v + " out of range");
            }
        }
        if (v.isArray()) {
            if ((s.has("minItems") && v.size() < s.get("minItems").asInt())
                    || (s.has("maxItems") && v.size() > s.get("maxItems").asInt())) {
                out.add(where + ": " + v.size() + " items");
            }
            if (s.has("items")) {
                for (int i = 0; i < v.size(); i++) {
                    check(where + "[" + i + "]", s.get("items"), v.get(i), out);
                }
            }
        }
    }

    @Test
    void aWrongWayStartWithItsMoverMatchesTheSchema() throws IOException {
        Event e = new Event("4f1c", "yard-mast-2", "lane-2-out", EventKind.WRONG_WAY, Event.Phase.START, 12.133,
                Instant.parse("2026-12-01T08:00:12Z"), 180.5, 30.06, 0.0904, Double.NaN, "clips/a.mp4", "clips/a.jpg",
                new Event.Mover(72, 48, 84, new double[] {0.5, 0.161, 0.502, 0.136, 0.496, 0.184}, 30.06, 22));
        JsonNode record = JSON.readTree(EventJson.toJson(e));
        assertEquals(List.of(), problems(schema(), record));
        assertEquals(3, record.get("mover_path").size());
        assertEquals(0.161, record.get("mover_path").get(0).get(1).asDouble(), 1e-9);
    }

    @Test
    void cameraEventsAndEndsMatchTheSchema() throws IOException {
        Event lost = new Event("9a", "gate", null, EventKind.CAMERA_LOST, Event.Phase.START, 3.5,
                Instant.parse("2026-12-01T08:00:00Z"), Double.NaN, Double.NaN, Double.NaN, Double.NaN);
        Event end = new Event("4f1c", "yard-mast-2", "door", EventKind.MOTION, Event.Phase.END, 20, Instant.EPOCH,
                90, 12, 0.2, 4.5);
        assertEquals(List.of(), problems(schema(), JSON.readTree(EventJson.toJson(lost))));
        assertEquals(List.of(), problems(schema(), JSON.readTree(EventJson.toJson(end))));
    }

    @Test
    void theCheckerCatchesAnUndeclaredFieldAndAWrongType() throws IOException {
        // the checker itself can fail: a made-up field and a string where a number belongs
        JsonNode bad = JSON.readTree("{\"id\":\"x\",\"camera\":\"c\",\"kind\":\"wrong_way\",\"phase\":\"start\","
                + "\"stream_s\":\"soon\",\"at\":\"2026-12-01T08:00:00Z\",\"mover_colour\":\"red\"}");
        List<String> p = problems(schema(), bad);
        assertTrue(p.contains("stream_s: \"soon\" is not of type number"), p.toString());
        assertTrue(p.contains("mover_colour: not declared in the schema"), p.toString());
    }

    @Test
    void aMoverReadsBackFromItsJson() {
        Event e = new Event("4f1c", "c", "z", EventKind.WRONG_WAY, Event.Phase.END, 16.8, Instant.EPOCH, 173.7,
                44.31, 0.1587, 4.667, null, null, new Event.Mover(44, 80, 153, new double[] {0.5, 0.161, 0.5, 0.853},
                        44.31, 177));
        assertEquals(e, EventJson.parse(EventJson.toJson(e).getBytes(java.nio.charset.StandardCharsets.UTF_8)));
    }
}
