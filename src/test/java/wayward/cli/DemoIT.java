package wayward.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import wayward.service.Service;

/** The README's first command, on the packaged jar: the demo scene played once as a camera, in real time. */
class DemoIT {
    @Test
    @Timeout(value = 180, unit = TimeUnit.SECONDS)
    void demoPrintsOneWrongWayEventForTheTruckAndWritesTheEventLog() throws Exception {
        Path dir = ProcessRunner.projectDir();
        // WAYWARD_HTTP: a free port instead of the default 7431, which another run on the same machine may hold
        // (a status server that cannot bind fails the start)
        ProcessRunner.Result r = ProcessRunner.run(List.of("java", "-jar", ProcessRunner.jar().toString(),
                "demo", "--loops", "1"), dir, 150, Map.of("WAYWARD_HTTP", "127.0.0.1:0"));
        assertEquals(0, r.exitCode(), r.stderr());
        List<String> lines = r.stdout().lines().filter(l -> !l.isBlank()).toList();
        assertEquals(2, lines.size(), "one start and one end:\n" + r.stdout());
        Map<String, Object> start = ReplayEndToEndTest.parse(lines.get(0));
        Map<String, Object> end = ReplayEndToEndTest.parse(lines.get(1));
        assertEquals("wrong_way", start.get("kind"));
        assertEquals("start", start.get("phase"));
        assertEquals("end", end.get("phase"));
        assertEquals(start.get("id"), end.get("id"));
        // ground truth (test-streams/yard-lane.truth.json): the truck enters the lane zone at 11.95 s
        double s = (Double) start.get("stream_s");
        assertTrue(s >= 11.95 - 0.5 && s <= 11.95 + 1.0, "start at " + s + " s");
        assertTrue(r.stderr().contains(Service.CAUTION), "the caution is logged at start");
        List<String> log = Files.readAllLines(dir.resolve("wayward-demo/events.jsonl"), StandardCharsets.UTF_8);
        assertEquals(lines, log.subList(log.size() - 2, log.size()), "the event log holds the same lines");
    }
}
