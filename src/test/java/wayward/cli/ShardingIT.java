package wayward.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.TreeSet;
import java.util.concurrent.TimeUnit;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;
import wayward.delivery.Mosquitto;
import wayward.testing.SchemaCheck;

/**
 * Three instances of the service on loopback share one config of 9 file cameras and one Mosquitto broker
 * (Debian), told apart only by WAYWARD_INSTANCE: every camera is watched by exactly one of them, the
 * wrong-way events of all 9 arrive at the broker (mosquitto_sub), each instance has its own status topic; and
 * with one instance gone from the list, `check` shows that only its cameras moved.
 */
class ShardingIT {
    private static final List<String> INSTANCES = List.of("north", "south", "gate");

    private static Process start(Path dir, Path config, String instance, String instances) throws Exception {
        ProcessBuilder pb = new ProcessBuilder("java", "-jar", ProcessRunner.jar().toString(), "run", "--config",
                config.toString()).directory(dir.toFile()).redirectErrorStream(true)
                .redirectOutput(dir.resolve(instance + ".log").toFile());
        pb.environment().put("WAYWARD_INSTANCE", instance);
        pb.environment().put("WAYWARD_INSTANCES", instances);
        return pb.start();
    }

    private static Set<String> checked(Path dir, Path config, String instance, String instances) throws Exception {
        ProcessBuilder pb = new ProcessBuilder("java", "-jar", ProcessRunner.jar().toString(), "check", "--config",
                config.toString()).directory(dir.toFile()).redirectErrorStream(true);
        pb.environment().put("WAYWARD_INSTANCE", instance);
        pb.environment().put("WAYWARD_INSTANCES", instances);
        Process p = pb.start();
        String out = new String(p.getInputStream().readAllBytes(), StandardCharsets.UTF_8);
        assertEquals(0, p.waitFor(), out);
        Matcher m = Pattern.compile("# instance " + instance + " of [^\\n]* watches: ([^\\n]*)").matcher(out);
        assertTrue(m.find(), out);
        return new TreeSet<>(List.of(m.group(1).split(", ")));
    }

    @Test
    @Timeout(value = 240, unit = TimeUnit.SECONDS)
    void everyCameraIsWatchedOnceAndRemovingAnInstanceMovesOnlyItsCameras(@TempDir Path dir) throws Exception {
        try (Mosquitto broker = new Mosquitto(dir.resolve("broker"), List.of())) {
            broker.start();
            StringBuilder toml = new StringBuilder(String.join("\n", "[service]", "data_dir = \"data\"",
                    "http = \"off\"", "[clips]", "enabled = false", "[mqtt]",
                    "url = \"mqtt://127.0.0.1:" + broker.port() + "\"", "topic_prefix = \"yard\"",
                    "client_id = \"wayward-it\"", ""));
            List<String> cameras = new ArrayList<>();
            for (int i = 1; i <= 9; i++) {
                String id = "yard-mast-" + i;
                cameras.add(id);
                toml.append(String.join("\n", "[[camera]]", "id = \"" + id + "\"", "source = \"" + YardSite.clip() + "\"",
                        "[[camera.zone]]", "id = \"lane-2-out\"",
                        "polygon = [[0.31, 0.98], [0.69, 0.98], [0.58, 0.10], [0.42, 0.10]]", "heading_deg = 0", ""));
            }
            Path config = dir.resolve("site.toml");
            Files.writeString(config, toml);
            Path got = dir.resolve("events.txt");
            Process sub = new ProcessBuilder("mosquitto_sub", "-h", "127.0.0.1", "-p", Integer.toString(broker.port()),
                    "-q", "1", "-v", "-t", "yard/+/+/event").redirectErrorStream(true).redirectOutput(got.toFile()).start();
            List<Process> running = new ArrayList<>();
            try {
                String all = String.join(",", INSTANCES);
                for (String i : INSTANCES) {
                    running.add(start(dir, config, i, all));
                }
                // every camera's wrong-way truck (12.3 s into the clip) arrives once from whichever instance has it
                long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(120);
                Set<String> started = new TreeSet<>();
                while (started.size() < 9 && System.nanoTime() < deadline) {
                    started.clear();
                    for (String line : Files.readAllLines(got)) {
                        if (line.contains("\"phase\":\"start\"") && line.contains("\"kind\":\"wrong_way\"")) {
                            started.add(line.split("/")[1]);
                        }
                    }
                    TimeUnit.MILLISECONDS.sleep(200); // polling the subscriber's file, not a synchronisation sleep
                }
                assertEquals(new TreeSet<>(cameras), started, "events of all 9 cameras at the one broker");
                for (String line : Files.readAllLines(got)) {
                    if (line.startsWith("yard/")) {
                        SchemaCheck.assertMqttLine("yard", line);
                    }
                }
                Map<String, Set<String>> watched = new java.util.HashMap<>();
                Set<String> union = new HashSet<>();
                int total = 0;
                for (String i : INSTANCES) {
                    String log = Files.readString(dir.resolve(i + ".log"));
                    Matcher m = Pattern.compile("instance " + i + " of \\[[^\\]]*\\]: watching (\\d+) of 9 cameras: \\[([^\\]]*)\\]")
                            .matcher(log);
                    assertTrue(m.find(), log);
                    Set<String> mine = m.group(2).isEmpty() ? Set.of() : new TreeSet<>(List.of(m.group(2).split(", ")));
                    watched.put(i, mine);
                    union.addAll(mine);
                    total += mine.size();
                    assertEquals(mine, checked(dir, config, i, all), "check agrees with the running instance " + i);
                }
                assertEquals(9, total, "no camera watched twice: " + watched);
                assertEquals(new TreeSet<>(cameras), new TreeSet<>(union), "every camera watched: " + watched);
                List<String> status = broker.retained("yard/status/+");
                assertEquals(3, status.size(), "a status topic per instance: " + status);
                status.forEach(l -> SchemaCheck.assertMqttLine("yard", l));

                // "south" leaves the list: the others keep what they had and take over only its cameras
                String rest = "north,gate";
                Set<String> north = checked(dir, config, "north", rest);
                Set<String> gate = checked(dir, config, "gate", rest);
                assertTrue(north.containsAll(watched.get("north")), north + " ⊇ " + watched.get("north"));
                assertTrue(gate.containsAll(watched.get("gate")), gate + " ⊇ " + watched.get("gate"));
                Set<String> movedTo = new TreeSet<>(north);
                movedTo.addAll(gate);
                assertEquals(new TreeSet<>(cameras), movedTo);
                assertEquals(9, north.size() + gate.size());
            } finally {
                for (Process p : running) {
                    p.destroy();
                }
                for (Process p : running) {
                    p.waitFor(20, TimeUnit.SECONDS);
                }
                sub.destroyForcibly();
            }
        }
    }
}
