package wayward.delivery;

import static org.junit.jupiter.api.Assertions.assertEquals;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import wayward.event.Event;
import wayward.event.EventKind;
import wayward.testing.SchemaCheck;

/** The retained camera state follows every open condition when they overlap, and each payload fits its schema. */
class CameraStatesTest {
    private static final ObjectMapper JSON = new ObjectMapper();
    private final CameraStates states = new CameraStates();
    private long seq;

    private static Event phase(String id, EventKind kind, Event.Phase phase) {
        return new Event(id, "gate", null, kind, phase, 1, Instant.parse("2026-12-03T08:00:00Z"), Double.NaN,
                Double.NaN, Double.NaN, Double.NaN);
    }

    /** state and conditions after the phase, as "state [conditions]"; the payload is checked on the way. */
    private String after(String id, EventKind kind, Event.Phase phase) throws IOException {
        return read(states.apply(seq++, phase(id, kind, phase)));
    }

    private static String read(byte[] payload) throws IOException {
        String text = new String(payload, StandardCharsets.UTF_8);
        SchemaCheck.assertValid(SchemaCheck.CAMERA_STATE, text);
        JsonNode n = JSON.readTree(text);
        List<String> c = new ArrayList<>();
        n.get("conditions").forEach(x -> c.add(x.asText()));
        return n.get("state").asText() + " " + c;
    }

    @Test
    void theEndOfOneConditionLeavesTheOthersOpen() throws IOException {
        assertEquals("watching [focus_lost]", after("f", EventKind.FOCUS_LOST, Event.Phase.START));
        assertEquals("watching [view_blocked, focus_lost]", after("b", EventKind.VIEW_BLOCKED, Event.Phase.START));
        assertEquals("watching [view_blocked, focus_lost, camera_moved]",
                after("m", EventKind.CAMERA_MOVED, Event.Phase.START));
        // before: the end of view_blocked set the camera to "watching" with nothing else said
        assertEquals("watching [focus_lost, camera_moved]", after("b", EventKind.VIEW_BLOCKED, Event.Phase.END));
        assertEquals("lost [focus_lost, camera_moved]", after("l", EventKind.CAMERA_LOST, Event.Phase.START));
        assertEquals("watching [focus_lost, camera_moved]", after("l", EventKind.CAMERA_LOST, Event.Phase.END));
        assertEquals("watching [focus_lost]", after("m", EventKind.CAMERA_MOVED, Event.Phase.END));
        assertEquals("watching []", after("f", EventKind.FOCUS_LOST, Event.Phase.END));
    }

    @Test
    void aTwoStreamCameraWhoseMainStreamIsDownStillWatches() throws IOException {
        Event mainLost = phase("s", EventKind.CAMERA_LOST, Event.Phase.START).withStream(Event.SOURCE);
        String text = new String(states.apply(seq++, mainLost), StandardCharsets.UTF_8);
        SchemaCheck.assertValid(SchemaCheck.CAMERA_STATE, text);
        assertEquals("watching", JSON.readTree(text).get("state").asText());
        assertEquals(true, JSON.readTree(text).get("source_lost").asBoolean(), text);
        Event analysisLost = phase("a", EventKind.CAMERA_LOST, Event.Phase.START).withStream(Event.ANALYSIS_SOURCE);
        assertEquals("lost []", read(states.apply(seq++, analysisLost)));
        assertEquals("lost []", read(states.apply(seq++, phase("s", EventKind.CAMERA_LOST, Event.Phase.END)
                .withStream(Event.SOURCE))));
        text = new String(states.apply(seq++, phase("a", EventKind.CAMERA_LOST, Event.Phase.END)
                .withStream(Event.ANALYSIS_SOURCE)), StandardCharsets.UTF_8);
        SchemaCheck.assertValid(SchemaCheck.CAMERA_STATE, text);
        assertEquals("watching", JSON.readTree(text).get("state").asText());
        assertEquals(null, JSON.readTree(text).get("source_lost"), text);
    }

    @Test
    void aRetryOrAnEndOfAnUnknownStartChangesNothing() throws IOException {
        Event start = phase("f", EventKind.FOCUS_LOST, Event.Phase.START);
        Event end = phase("f", EventKind.FOCUS_LOST, Event.Phase.END);
        assertEquals("watching [focus_lost]", read(states.apply(1, start)));
        assertEquals("watching []", read(states.apply(2, end)));
        // the courier sends seq 1 again (a retry after seq 2 went): the condition stays closed
        assertEquals("watching []", read(states.apply(1, start)));
        // an end closed at a restart, for a start of an earlier run: nothing was open, nothing changes
        assertEquals("watching [picture_frozen]", read(states.apply(3,
                phase("p", EventKind.PICTURE_FROZEN, Event.Phase.START))));
        assertEquals("watching [picture_frozen]", read(states.apply(4,
                phase("older", EventKind.PICTURE_FROZEN, Event.Phase.END))));
    }

    @Test
    void camerasAreKeptApart() throws IOException {
        states.apply(1, phase("l", EventKind.CAMERA_LOST, Event.Phase.START));
        Event other = new Event("b", "dock", null, EventKind.VIEW_BLOCKED, Event.Phase.START, 1, Instant.EPOCH,
                Double.NaN, Double.NaN, Double.NaN, Double.NaN);
        assertEquals("watching [view_blocked]", read(states.apply(2, other)));
    }

    @Test
    void zoneAndStatusPayloadsFitTheirSchemas() {
        Event start = new Event("w", "gate", "lane", EventKind.WRONG_WAY, Event.Phase.START, 1, Instant.EPOCH, 180, 20,
                0.1, Double.NaN);
        SchemaCheck.assertValid(SchemaCheck.ZONE_STATE, text(MqttTopics.zoneStatePayload(start)));
        SchemaCheck.assertValid(SchemaCheck.ZONE_STATE, text(MqttTopics.clearPayload()));
        SchemaCheck.assertValid(SchemaCheck.STATUS, text(MqttTopics.statusPayload("wayward-gate", "online", true)));
        SchemaCheck.assertValid(SchemaCheck.STATUS, text(MqttTopics.statusPayload("wayward-gate", "offline", false)));
        // the checks can fail: an online status without its time, a camera state without its conditions
        assertEquals(1, SchemaCheck.problems(SchemaCheck.STATUS,
                text(MqttTopics.statusPayload("wayward-gate", "online", false))).size());
        assertEquals(1, SchemaCheck.problems(SchemaCheck.CAMERA_STATE,
                "{\"state\":\"watching\",\"event\":\"x\",\"kind\":\"focus_lost\",\"phase\":\"end\","
                        + "\"at\":\"2026-12-03T08:00:00Z\"}").size());
    }

    private static String text(byte[] b) {
        return new String(b, StandardCharsets.UTF_8);
    }
}
