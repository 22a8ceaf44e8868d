package wayward.cli;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import wayward.testing.SchemaCheck;

/**
 * The integration tests' site: the demo lane (same zone as conf/demo.toml) watched from any source, data under
 * the test's folder, and a way to wait for events in its log.
 */
final class YardSite {
    private YardSite() {
    }

    /** Writes site.toml into {@code dir} for a camera reading {@code source}; extra tables go first. */
    static Path config(Path dir, String source, String... extraTables) throws IOException {
        return config(dir, source, false, extraTables);
    }

    /** The demo clip as a camera that loops (a live camera that never ends); extra tables go first. */
    static Path looping(Path dir, String... extraTables) throws IOException {
        return config(dir, clip().toString(), true, extraTables);
    }

    private static Path config(Path dir, String source, boolean loop, String... extraTables) throws IOException {
        List<String> lines = new ArrayList<>(List.of("[service]", "data_dir = \"data\""));
        if (List.of(extraTables).stream().noneMatch(l -> l.startsWith("http ="))) {
            lines.add("http = \"off\""); // tests that want the status server pass their own address
        }
        lines.addAll(List.of(extraTables));
        lines.addAll(List.of(
                "[[camera]]",
                "id = \"yard-mast-2\"",
                loop ? "loop = true" : "",
                "source = \"" + source + "\"",
                "[[camera.zone]]",
                "id = \"lane-2-out\"",
                "polygon = [[0.31, 0.98], [0.69, 0.98], [0.58, 0.10], [0.42, 0.10]]",
                "heading_deg = 0",
                ""));
        Path config = dir.resolve("site.toml");
        Files.writeString(config, String.join("\n", lines));
        return config;
    }

    /** The demo clip. */
    static Path clip() {
        return ProcessRunner.projectDir().resolve("test-streams/yard-lane.mp4");
    }

    /** Starts {@code run} on the packaged jar in {@code dir}, its output in service.log. */
    static Process startService(Path dir, Path config) throws IOException {
        return new ProcessBuilder("java", "-jar", ProcessRunner.jar().toString(), "run", "--config",
                config.toString()).directory(dir.toFile()).redirectErrorStream(true)
                .redirectOutput(dir.resolve("service.log").toFile()).start();
    }

    /** Event phases in the log so far, each line held to the shipped event schema. */
    static List<Map<String, Object>> events(Path log) throws IOException {
        List<Map<String, Object>> out = new ArrayList<>();
        if (Files.exists(log)) {
            for (String line : Files.readAllLines(log, StandardCharsets.UTF_8)) {
                if (line.endsWith("}")) {
                    SchemaCheck.assertEventRecord(line); // every record the service logs fits the shipped schema
                    out.add(ReplayEndToEndTest.parse(line));
                }
            }
        }
        return out;
    }

    /** Waits (polling the log) for the n-th event phase of a kind; returns its index in the log. */
    static int awaitEvent(Path log, String kind, String phase, int n, long timeoutSeconds) throws Exception {
        return (Integer) await(log, kind, phase, n, timeoutSeconds)[0];
    }

    /** The same wait; returns the event record itself. */
    @SuppressWarnings("unchecked")
    static Map<String, Object> awaitRecord(Path log, String kind, String phase, int n, long timeoutSeconds)
            throws Exception {
        return (Map<String, Object>) await(log, kind, phase, n, timeoutSeconds)[1];
    }

    private static Object[] await(Path log, String kind, String phase, int n, long timeoutSeconds) throws Exception {
        long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(timeoutSeconds);
        while (System.nanoTime() < deadline) {
            List<Map<String, Object>> ev = events(log);
            int seen = 0;
            for (int i = 0; i < ev.size(); i++) {
                if (kind.equals(ev.get(i).get("kind")) && phase.equals(ev.get(i).get("phase")) && ++seen == n) {
                    return new Object[] {i, ev.get(i)};
                }
            }
            TimeUnit.MILLISECONDS.sleep(200); // polling interval of the wait, not a synchronisation sleep
        }
        throw new AssertionError("no " + kind + " " + phase + " #" + n + " within " + timeoutSeconds + " s; log: "
                + events(log));
    }

    /** Runs an outside command to its end (exit 0 expected); returns its output. */
    static String command(String... command) throws Exception {
        Process p = new ProcessBuilder(command).redirectErrorStream(true).start();
        String out = new String(p.getInputStream().readAllBytes(), StandardCharsets.UTF_8);
        if (p.waitFor() != 0) {
            throw new AssertionError(String.join(" ", command) + " failed:\n" + out);
        }
        return out.trim();
    }
}
