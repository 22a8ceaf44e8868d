package wayward.delivery;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Instant;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import wayward.event.Event;
import wayward.event.EventJson;
import wayward.event.EventKind;
import wayward.testing.SchemaCheck;

/** Events a stopped run left open are found in its log and closed with an end that says why. */
class EventLogTest {
    private static Event phase(String id, EventKind kind, Event.Phase phase) {
        boolean camera = kind == EventKind.CAMERA_LOST;
        return new Event(id, "yard-mast-2", camera ? null : "lane-2-out", kind, phase, 12.3,
                Instant.parse("2026-12-02T10:00:00Z"), camera ? Double.NaN : 180, camera ? Double.NaN : 45,
                camera ? Double.NaN : 0.04, Double.NaN);
    }

    /** The log's whole lines, each held to the shipped event schema. */
    private static List<String> checkedLines(Path file) throws java.io.IOException {
        List<String> lines = Files.readAllLines(file, StandardCharsets.UTF_8);
        lines.stream().filter(l -> l.endsWith("}")).forEach(SchemaCheck::assertEventRecord);
        return lines;
    }

    @Test
    void aLogOfThePreviousVersionStillShowsWhatWasLeftOpen(@TempDir Path dir) throws Exception {
        // literal lines as the version before the schema field wrote them: camera_back ended camera_lost
        Path file = dir.resolve("events.jsonl");
        Files.writeString(file, String.join("\n",
                "{\"id\":\"o1\",\"camera\":\"yard-mast-2\",\"kind\":\"camera_lost\",\"phase\":\"start\",\"stream_s\":3,"
                        + "\"at\":\"2026-12-02T10:00:00Z\"}",
                "{\"id\":\"o1\",\"camera\":\"yard-mast-2\",\"kind\":\"camera_back\",\"phase\":\"end\",\"stream_s\":9,"
                        + "\"at\":\"2026-12-02T10:00:06Z\",\"duration_s\":6.0}",
                "{\"id\":\"w1\",\"camera\":\"yard-mast-2\",\"zone\":\"lane-2-out\",\"kind\":\"wrong_way\",\"phase\":\"start\","
                        + "\"stream_s\":12.3,\"at\":\"2026-12-02T10:00:09Z\",\"heading_deg\":181.0,\"speed\":36.27,"
                        + "\"coverage\":0.0556}", ""), StandardCharsets.UTF_8);
        List<Event> open = EventLog.leftOpen(file);
        assertEquals(List.of("w1"), open.stream().map(Event::id).toList(), "the outage o1 ended");
        assertEquals(0.0556, open.get(0).share());
        // what the new run appends for it is in the new form
        EventLog log = new EventLog(dir);
        log.deliver(open.get(0).closedAtRestart(Instant.parse("2026-12-03T08:00:00Z")));
        log.close();
        List<String> lines = Files.readAllLines(file, StandardCharsets.UTF_8);
        SchemaCheck.assertEventRecord(lines.get(lines.size() - 1));
    }

    @Test
    void startsWithoutAnEndAreLeftOpenAndClosedWithTheReason(@TempDir Path dir) throws Exception {
        EventLog log = new EventLog(dir);
        log.deliver(phase("a1", EventKind.WRONG_WAY, Event.Phase.START));
        log.deliver(phase("b2", EventKind.WRONG_WAY, Event.Phase.START));
        log.deliver(phase("a1", EventKind.WRONG_WAY, Event.Phase.END));
        log.deliver(phase("c3", EventKind.CAMERA_LOST, Event.Phase.START));
        log.close();
        checkedLines(log.file());
        // a crash in the middle of a write leaves half a line
        Files.writeString(log.file(), "{\"id\":\"d4\",\"camera\":\"yard-ma", StandardCharsets.UTF_8,
                java.nio.file.StandardOpenOption.APPEND);
        List<Event> open = EventLog.leftOpen(log.file());
        assertEquals(List.of("b2", "c3"), open.stream().map(Event::id).toList());
        Event end = open.get(0).closedAtRestart(Instant.parse("2026-12-03T08:00:00Z"));
        assertEquals(Event.Phase.END, end.phase());
        assertEquals(EventKind.WRONG_WAY, end.kind());
        assertEquals("lane-2-out", end.zone());
        String json = EventJson.toJson(end);
        assertTrue(json.contains("\"phase\":\"end\"") && json.contains("\"ended_by\":\"service_stopped\""), json);
        assertEquals(end, EventJson.parse(json.getBytes(StandardCharsets.UTF_8)), "read back as written");
        assertEquals(List.of(), EventLog.leftOpen(dir.resolve("no-such.jsonl")));
    }

    @Test
    void linesTheDiskRefusedAreWrittenLaterInOrderAndTheLogRollsOverAndFollowsARotator(@TempDir Path dir)
            throws Exception {
        EventLog log = new EventLog(dir, 1000, java.time.Clock.fixed(Instant.parse("2026-12-03T08:00:00Z"),
                java.time.ZoneOffset.UTC));
        log.deliver(phase("a1", EventKind.WRONG_WAY, Event.Phase.START));
        // the file cannot be written (here: something else took its name), as when the disk is full
        Path aside = dir.resolve("moved.jsonl");
        Files.move(log.file(), aside);
        Files.createDirectory(log.file());
        org.junit.jupiter.api.Assertions.assertThrows(java.io.UncheckedIOException.class,
                () -> log.deliver(phase("a1", EventKind.WRONG_WAY, Event.Phase.END)));
        Files.delete(log.file());
        // like a log rotator that moved the file away: the next write starts a new one, the held line first
        log.deliver(phase("b2", EventKind.WRONG_WAY, Event.Phase.START));
        List<String> lines = checkedLines(log.file());
        assertEquals(List.of("end a1", "start b2"), lines.stream().map(l -> {
            Event e = EventJson.parse(l.getBytes(StandardCharsets.UTF_8));
            return e.phase().jsonName() + " " + e.id();
        }).toList());
        // past 1000 bytes the log is renamed with the time and a new one begun
        for (int i = 0; i < 6; i++) {
            log.deliver(phase("c" + i, EventKind.WRONG_WAY, Event.Phase.START));
        }
        assertTrue(Files.isRegularFile(dir.resolve("events-20261203-080000.jsonl")));
        checkedLines(dir.resolve("events-20261203-080000.jsonl"));
        checkedLines(log.file());
        assertEquals(0, log.dropped());
    }
}
