package wayward.event;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;
import java.time.Instant;
import java.util.List;
import org.junit.jupiter.api.Test;
import wayward.testing.SchemaCheck;

/**
 * Holds the JSON form of event phases to the shipped schema (src/main/resources/schema/event.schema.json, JSON
 * Schema 2020-12) through networknt's validator ({@link SchemaCheck}): every kind and phase the code can write,
 * and records that must fail it (so the check can fail).
 */
class EventSchemaTest {
    private static final Instant AT = Instant.parse("2026-12-01T08:00:12Z");

    private static void assertValid(Event e) {
        SchemaCheck.assertEventRecord(EventJson.toJson(e));
    }

    @Test
    void aWrongWayStartWithItsMoverMatchesTheSchema() {
        Event e = new Event("4f1c", "yard-mast-2", "lane-2-out", EventKind.WRONG_WAY, Event.Phase.START, 12.133, AT,
                180.5, 30.06, 0.0904, Double.NaN, "clips/a.mp4", "clips/a.jpg",
                new Event.Mover(72, 48, 84, new double[] {0.5, 0.161, 0.502, 0.136, 0.496, 0.184}, 30.06, 22));
        assertValid(e);
        assertValid(e.closedAtRestart(AT.plusSeconds(60)));
    }

    @Test
    void everyKindAndPhaseTheCodeWritesMatchesTheSchema() {
        for (EventKind k : EventKind.values()) {
            boolean zone = k == EventKind.WRONG_WAY || k == EventKind.MOTION;
            double bearing = zone || k == EventKind.CAMERA_MOVED ? 359.97 : Double.NaN; // rounds to 0.0, not 360
            double speed = zone ? 12.5 : Double.NaN;
            double share = zone ? 0.2 : Double.NaN;
            double shift = k == EventKind.CAMERA_MOVED ? 4.47 : Double.NaN;
            Event start;
            Event end;
            if (k == EventKind.CAMERA_REASSIGNED) {
                Event.Handover h = new Event.Handover("south", "north", "south went offline");
                start = Event.handover("id-" + k, "gate", Event.Phase.START, AT, h);
                end = Event.handover("id-" + k, "gate", Event.Phase.END, AT, h);
                assertEquals(start, EventJson.parse(EventJson.toJson(start).getBytes(
                        java.nio.charset.StandardCharsets.UTF_8)), "read back as written");
            } else if (k == EventKind.ZONE_MUTED || k == EventKind.CAMERA_MUTED || k == EventKind.ZONE_OFF_HOURS) {
                String z = k == EventKind.CAMERA_MUTED ? null : "door";
                boolean hours = k == EventKind.ZONE_OFF_HOURS;
                start = Event.control("id-" + k, "gate", z, k, Event.Phase.START, AT, Double.NaN, null,
                        new Event.Control(AT.plusSeconds(3600), hours ? null : "control-room", "sweeper in lane 2"));
                end = Event.control("id-" + k, "gate", z, k, Event.Phase.END, AT.plusSeconds(600), 600,
                        hours ? null : Event.EXPIRED, new Event.Control(null, null, ""));
                assertEquals(start, EventJson.parse(EventJson.toJson(start).getBytes(
                        java.nio.charset.StandardCharsets.UTF_8)), "read back as written");
                assertEquals(end, EventJson.parse(EventJson.toJson(end).getBytes(
                        java.nio.charset.StandardCharsets.UTF_8)), "read back as written");
            } else {
                start = new Event("id-" + k, "gate", zone ? "door" : null, k, Event.Phase.START, 3.5, AT, bearing,
                        speed, share, shift, Double.NaN, null, null, null, null);
                end = new Event("id-" + k, "gate", zone ? "door" : null, k, Event.Phase.END, 8, AT, bearing, speed,
                        share, Double.NaN, 4.5, null, null, null, null);
            }
            assertValid(start);
            assertValid(end);
            assertValid(start.closedAtRestart(AT));
        }
    }

    @Test
    void aRecordWithAWrongTypeOrAnUnnamedFieldFails() {
        String good = EventJson.toJson(new Event("9a", "gate", null, EventKind.CAMERA_LOST, Event.Phase.START, 3.5, AT,
                Double.NaN, Double.NaN, Double.NaN, Double.NaN));
        assertEquals(List.of(), SchemaCheck.problems(SchemaCheck.EVENT, good));
        // the same record with a string where the schema has a number
        List<String> wrongType = SchemaCheck.problems(SchemaCheck.EVENT, good.replace("\"stream_s\":3.5",
                "\"stream_s\":\"soon\""));
        assertEquals(1, wrongType.size(), wrongType.toString());
        assertTrue(wrongType.get(0).contains("stream_s") && wrongType.get(0).contains("number"), wrongType.toString());
        // a field the schema does not name (additionalProperties false)
        List<String> unnamed = SchemaCheck.problems(SchemaCheck.EVENT, good.replace("}", ",\"colour\":\"red\"}"));
        assertTrue(unnamed.toString().contains("colour"), unnamed.toString());
        // a wall-clock time that is not RFC 3339 date-time (format assertions are on)
        assertFalse(SchemaCheck.problems(SchemaCheck.EVENT, good.replace("2026-12-01T08:00:12Z", "yesterday")).isEmpty());
        // a schema version this schema does not describe
        assertFalse(SchemaCheck.problems(SchemaCheck.EVENT, good.replace("\"schema\":1", "\"schema\":2")).isEmpty());
    }

    @Test
    void aReadingUnderAnotherKindsNameFails() {
        // one name, one meaning: the share moving at all never appears on a wrong_way record, nor a zone on a camera
        String wrongWay = EventJson.toJson(new Event("4f1c", "gate", "lane", EventKind.WRONG_WAY, Event.Phase.START,
                3, AT, 180, 20, 0.1, Double.NaN));
        SchemaCheck.assertEventRecord(wrongWay);
        assertFalse(SchemaCheck.problems(SchemaCheck.EVENT, wrongWay.replace("against_share", "moving_share")).isEmpty());
        assertFalse(SchemaCheck.problems(SchemaCheck.EVENT, wrongWay.replace("\"wrong_way\"", "\"focus_lost\""))
                .isEmpty());
        assertFalse(SchemaCheck.problems(SchemaCheck.EVENT, wrongWay.replace("\"zone\":\"lane\",", "")).isEmpty());
    }

    @Test
    void aMoverReadsBackFromItsJson() {
        Event e = new Event("4f1c", "c", "z", EventKind.WRONG_WAY, Event.Phase.END, 16.8, Instant.EPOCH, 173.7,
                44.31, 0.1587, 4.667, null, null, new Event.Mover(44, 80, 153, new double[] {0.5, 0.161, 0.5, 0.853},
                        44.31, 177));
        assertEquals(e, EventJson.parse(EventJson.toJson(e).getBytes(StandardCharsets.UTF_8)));
    }

    @Test
    void aTwoStreamCameraNamesTheStreamUnderOneNamePerKind() {
        Event wrongWay = new Event("4f1c", "yard-mast-2", "lane-2-out", EventKind.WRONG_WAY, Event.Phase.START, 12.133,
                AT, 180.5, 30.06, 0.0904, Double.NaN, "evidence/a.mp4", "evidence/a.jpg").withStream(Event.SOURCE);
        String json = EventJson.toJson(wrongWay);
        assertTrue(json.contains("\"evidence_stream\":\"source\""), json);
        assertValid(wrongWay);
        assertValid(wrongWay.withStream(Event.ANALYSIS_SOURCE));
        assertEquals(wrongWay, EventJson.parse(json.getBytes(StandardCharsets.UTF_8)));
        Event lost = new Event("77aa", "yard-mast-2", null, EventKind.CAMERA_LOST, Event.Phase.START, 3.2, AT,
                Double.NaN, Double.NaN, Double.NaN, Double.NaN).withStream(Event.SOURCE);
        String lostJson = EventJson.toJson(lost);
        assertTrue(lostJson.contains("\"stream\":\"source\""), lostJson);
        assertValid(lost);
        assertEquals(lost, EventJson.parse(lostJson.getBytes(StandardCharsets.UTF_8)));
        // one name, one meaning: a zone event never says "stream", a camera event never "evidence_stream", and only
        // the two config keys are stream names
        assertFalse(SchemaCheck.problems(SchemaCheck.EVENT, json.replace("evidence_stream", "stream")).isEmpty());
        assertFalse(SchemaCheck.problems(SchemaCheck.EVENT, lostJson.replace("\"stream\"", "\"evidence_stream\""))
                .isEmpty());
        assertFalse(SchemaCheck.problems(SchemaCheck.EVENT, lostJson.replace("\"source\"", "\"main\"")).isEmpty());
        String blocked = EventJson.toJson(new Event("88bb", "yard-mast-2", null, EventKind.VIEW_BLOCKED,
                Event.Phase.START, 3.2, AT, Double.NaN, Double.NaN, Double.NaN, Double.NaN));
        assertFalse(SchemaCheck.problems(SchemaCheck.EVENT, blocked.replace("}", ",\"stream\":\"source\"}")).isEmpty());
    }
}
