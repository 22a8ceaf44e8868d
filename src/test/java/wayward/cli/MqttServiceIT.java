package wayward.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;
import wayward.delivery.Mosquitto;
import wayward.testing.SchemaCheck;

/**
 * The service ({@code run}, packaged jar) publishing to a real Mosquitto broker (Debian), watched by
 * mosquitto_sub: the broker is down, the service is killed with SIGKILL after an alert was accepted, a torn
 * record is left at the outbox's end, then broker and service start again: every phase in the event log
 * arrives, in order; and the will marks the service offline when it is killed (MQTT 3.1.1 §3.1.2.5).
 */
class MqttServiceIT {
    private static List<Path> segments(Path outbox) throws Exception {
        if (!Files.isDirectory(outbox)) {
            return List.of();
        }
        try (Stream<Path> s = Files.list(outbox)) {
            return s.filter(p -> p.getFileName().toString().startsWith("segment-")).sorted().toList();
        }
    }

    private static long outboxBytes(Path outbox) throws Exception {
        long n = 0;
        for (Path p : segments(outbox)) {
            n += Files.size(p);
        }
        return n;
    }

    @Test
    @Timeout(value = 240, unit = TimeUnit.SECONDS)
    void killedDuringABrokerOutageAndRestartedStillDeliversEveryPhase(@TempDir Path dir) throws Exception {
        try (Mosquitto broker = new Mosquitto(dir.resolve("broker"), List.of())) {
            broker.start();
            String port = Integer.toString(broker.port());
            // the checking client's persistent session: the broker queues QoS 1 messages for it while it is away
            Mosquitto.client(10, "mosquitto_sub", "-h", "127.0.0.1", "-p", port, "-c", "-i", "yard-checker", "-q",
                    "1", "-t", "yard/+/+/event", "-W", "1");
            broker.stop();

            Path config = YardSite.config(dir, YardSite.clip().toString(),
                    "[clips]", "enabled = false",
                    "[mqtt]", "url = \"mqtt://127.0.0.1:" + port + "\"", "topic_prefix = \"yard\"",
                    "client_id = \"wayward-it\"", "max_backoff_seconds = 2");
            Path log = dir.resolve("data/events.jsonl");
            Path outbox = dir.resolve("data/outbox");

            Process first = YardSite.startService(dir, config);
            YardSite.awaitEvent(log, "wrong_way", "start", 1, 60);
            long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(10);
            while (outboxBytes(outbox) == 0 && System.nanoTime() < deadline) {
                TimeUnit.MILLISECONDS.sleep(20); // polling for the outbox append, not a synchronisation sleep
            }
            assertTrue(outboxBytes(outbox) > 0, "the start phase was accepted into the outbox");
            first.destroyForcibly().waitFor(); // SIGKILL: no shutdown hook, nothing flushed
            List<Map<String, Object>> beforeKill = YardSite.events(log);
            // a crash in the middle of a write leaves part of a record at the end of the newest segment
            List<Path> segs = segments(outbox);
            Files.write(segs.get(segs.size() - 1), new byte[] {0x57, 0x59, 0x4f, 0x42, 0, 0, 1},
                    StandardOpenOption.APPEND);

            broker.start();
            Path got = dir.resolve("checker.txt");
            Process checker = new ProcessBuilder("mosquitto_sub", "-h", "127.0.0.1", "-p", port, "-c", "-i",
                    "yard-checker", "-q", "1", "-t", "yard/+/+/event", "-v")
                    .redirectErrorStream(true).redirectOutput(got.toFile()).start();
            Process second = YardSite.startService(dir.resolve("."), config);
            try {
                // the second run first ends the event the killed run left open (ended_by service_stopped), then
                // watches the clip again: one more start and its end
                YardSite.awaitEvent(log, "wrong_way", "end", 2, 90);
                List<Map<String, Object>> all = YardSite.events(log);
                List<String> expected = new ArrayList<>();
                for (Map<String, Object> e : all) {
                    if (e.get("zone") != null) {
                        expected.add(e.get("id") + " " + e.get("phase"));
                    }
                }
                assertTrue(beforeKill.stream().anyMatch(e -> "start".equals(e.get("phase"))));
                assertEquals(4, expected.size(), "start of run 1 (killed), its end at the restart, start and end"
                        + " of run 2: " + all);
                List<Map<String, Object>> zoned = all.stream().filter(e -> e.get("zone") != null).toList();
                assertEquals(zoned.get(0).get("id"), zoned.get(1).get("id"), "the killed run's event is the one ended");
                assertEquals("service_stopped", zoned.get(1).get("ended_by"), all.toString());
                deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(30);
                List<String> arrived = arrived(got);
                while (!arrived.containsAll(expected) && System.nanoTime() < deadline) {
                    TimeUnit.MILLISECONDS.sleep(100);
                    arrived = arrived(got);
                }
                assertEquals(expected, arrived.stream().distinct().toList(), "every phase once at least, in order");
                String serviceLog = Files.readString(dir.resolve("service.log"));
                assertTrue(serviceLog.contains("ends in a torn or damaged record"), serviceLog);

                // the will: killed without DISCONNECT, the broker publishes the retained offline status
                assertTrue(awaitStatus(broker, "\"state\":\"online\""), broker.log());
            } finally {
                second.destroyForcibly().waitFor();
                checker.destroyForcibly();
            }
            assertTrue(awaitStatus(broker, "\"state\":\"offline\""), "the will after SIGKILL\n" + broker.log());
        }
    }

    private static boolean awaitStatus(Mosquitto broker, String state) throws Exception {
        long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(20);
        while (System.nanoTime() < deadline) {
            List<String> s = broker.retained("yard/status/+");
            s.forEach(l -> SchemaCheck.assertMqttLine("yard", l));
            if (s.size() == 1 && s.get(0).startsWith("yard/status/wayward-it ") && s.get(0).contains(state)) {
                return true;
            }
            TimeUnit.MILLISECONDS.sleep(200);
        }
        return false;
    }

    /** "id phase" of each event message received so far, in arrival order. */
    private static List<String> arrived(Path file) throws Exception {
        List<String> out = new ArrayList<>();
        if (!Files.exists(file)) {
            return out;
        }
        for (String line : Files.readAllLines(file, StandardCharsets.UTF_8)) {
            int sp = line.indexOf(' ');
            if (sp > 0 && line.endsWith("}")) {
                SchemaCheck.assertMqttLine("yard", line);
                Map<String, Object> e = ReplayEndToEndTest.parse(line.substring(sp + 1));
                out.add(e.get("id") + " " + e.get("phase"));
            }
        }
        return out;
    }
}
