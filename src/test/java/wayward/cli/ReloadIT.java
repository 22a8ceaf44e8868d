package wayward.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.TimeUnit;
import java.util.function.Predicate;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;
import wayward.delivery.Mosquitto;

/**
 * SIGHUP (what {@code systemctl reload} sends, through the unit's ExecReload) on the running service: a good
 * new config restarts only the changed camera, starts the added one and leaves the unchanged one running;
 * a bad one is refused with its located mistakes in the log, and the running config stays.
 */
class ReloadIT {
    private final HttpClient http = HttpClient.newBuilder().connectTimeout(Duration.ofSeconds(5)).build();

    private static String camera(String id, int minTravelPx) {
        return String.join("\n", "[[camera]]", "id = \"" + id + "\"", "source = \"" + YardSite.clip() + "\"",
                "loop = true", "[[camera.zone]]", "id = \"lane-2-out\"",
                "polygon = [[0.31, 0.98], [0.69, 0.98], [0.58, 0.10], [0.42, 0.10]]", "heading_deg = 0",
                "min_travel_px = " + minTravelPx, "");
    }

    private static void write(Path config, int port, String... cameras) throws Exception {
        Files.writeString(config, String.join("\n", "[service]", "data_dir = \"data\"",
                "http = \"127.0.0.1:" + port + "\"", "[clips]", "enabled = false", "") + String.join("\n", cameras));
    }

    /** frames_analysed per camera id from /api/cameras, in the API's order. */
    private List<String[]> cameras(int port) throws Exception {
        String body = http.send(HttpRequest.newBuilder(URI.create("http://127.0.0.1:" + port + "/api/cameras"))
                .timeout(Duration.ofSeconds(5)).build(), HttpResponse.BodyHandlers.ofString()).body();
        List<String[]> out = new ArrayList<>();
        Matcher m = Pattern.compile("\"id\":\"(yard-mast-\\d)\".*?\"frames_analysed\":(\\d+)").matcher(body);
        while (m.find()) {
            out.add(new String[] {m.group(1), m.group(2)});
        }
        return out;
    }

    private static long frames(List<String[]> cams, String id) {
        return cams.stream().filter(c -> c[0].equals(id)).mapToLong(c -> Long.parseLong(c[1])).findFirst().orElse(-1);
    }

    private static String awaitLog(Path log, Predicate<String> done, long seconds) throws Exception {
        long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(seconds);
        String text = "";
        while (System.nanoTime() < deadline) {
            text = Files.exists(log) ? Files.readString(log) : "";
            if (done.test(text)) {
                return text;
            }
            TimeUnit.MILLISECONDS.sleep(100); // polling the log, not a synchronisation sleep
        }
        throw new AssertionError("log did not get there:\n" + text);
    }

    @Test
    @Timeout(value = 180, unit = TimeUnit.SECONDS)
    void aGoodConfigRestartsOnlyWhatChangedAndABadOneIsRefused(@TempDir Path dir) throws Exception {
        int port = Mosquitto.freePort();
        Path config = dir.resolve("site.toml");
        write(config, port, camera("yard-mast-2", 10), camera("yard-mast-3", 10));
        Process service = YardSite.startService(dir, config);
        Path log = dir.resolve("service.log");
        try {
            awaitLog(log, t -> t.contains("status server on"), 30);
            long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(30);
            List<String[]> before = List.of();
            while (System.nanoTime() < deadline) {
                before = cameras(port);
                if (before.size() == 2 && frames(before, "yard-mast-2") > 30 && frames(before, "yard-mast-3") > 30) {
                    break;
                }
                TimeUnit.MILLISECONDS.sleep(200); // polling the API, not a synchronisation sleep
            }
            assertTrue(frames(before, "yard-mast-3") > 30, "both cameras analysing");

            // mast-3's zone changes, mast-4 is added, mast-2 stays as it was
            write(config, port, camera("yard-mast-2", 10), camera("yard-mast-3", 12), camera("yard-mast-4", 10));
            YardSite.command("kill", "-HUP", Long.toString(service.pid()));
            String text = awaitLog(log, t -> t.contains("reload: done; 3 cameras"), 30);
            assertTrue(text.contains("reload: camera yard-mast-2 unchanged; it keeps running"), text);
            assertTrue(text.contains("reload: camera yard-mast-3 changed; restarting it"), text);
            assertTrue(text.contains("reload: camera yard-mast-4 added; starting on"), text);
            List<String[]> after = cameras(port);
            assertEquals(List.of("yard-mast-2", "yard-mast-3", "yard-mast-4"), after.stream().map(c -> c[0]).toList());
            assertTrue(frames(after, "yard-mast-2") >= frames(before, "yard-mast-2"),
                    "the unchanged camera's pipeline was not replaced: its count goes on");
            assertTrue(frames(after, "yard-mast-3") < frames(before, "yard-mast-3"),
                    "the changed camera starts over");

            // a mistake: refused, located, nothing stops
            Files.writeString(config, Files.readString(config).replace("min_travel_px = 12", "min_travle_px = 12"));
            YardSite.command("kill", "-HUP", Long.toString(service.pid()));
            text = awaitLog(log, t -> t.contains("reload refused"), 30);
            assertTrue(Pattern.compile("reload: " + Pattern.quote(config.toString())
                    + ":\\d+:\\d+: camera\\[1\\]\\.zone\\[0\\]\\.min_travle_px: 12 \\(unknown key").matcher(text).find(), text);
            assertTrue(text.contains("reload refused (1 mistake); the running config stays"), text);
            assertEquals(3, cameras(port).size());
            assertTrue(service.isAlive());
        } finally {
            service.destroy();
            service.waitFor(20, TimeUnit.SECONDS);
        }
    }
}
