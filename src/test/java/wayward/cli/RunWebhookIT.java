package wayward.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;

import com.sun.net.httpserver.HttpServer;
import java.net.InetSocketAddress;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import java.util.concurrent.CopyOnWriteArrayList;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicInteger;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;

/**
 * The service ({@code run}) on the packaged jar with a file camera and a webhook receiver on loopback (the
 * JDK's com.sun.net.httpserver) that fails its first request with 500: both phases arrive, in order.
 */
class RunWebhookIT {
    @Test
    @Timeout(value = 180, unit = TimeUnit.SECONDS)
    void serviceDeliversStartAndEndToTheWebhookDespiteA500(@TempDir Path dir) throws Exception {
        List<String> bodies = new CopyOnWriteArrayList<>();
        AtomicInteger calls = new AtomicInteger();
        HttpServer server = HttpServer.create(new InetSocketAddress("127.0.0.1", 0), 0);
        server.createContext("/hook", ex -> {
            String body = new String(ex.getRequestBody().readAllBytes(), StandardCharsets.UTF_8);
            int status = calls.getAndIncrement() == 0 ? 500 : 200;
            if (status == 200) {
                bodies.add(body);
            }
            ex.sendResponseHeaders(status, -1);
            ex.close();
        });
        server.start();
        try {
            Path clip = ProcessRunner.projectDir().resolve("test-streams/yard-lane.mp4");
            Path config = dir.resolve("site.toml");
            Files.writeString(config, String.join("\n",
                    "[service]",
                    "data_dir = \"data\"",
                    "[[camera]]",
                    "id = \"yard-mast-2\"",
                    "source = \"" + clip + "\"",
                    "[[camera.zone]]",
                    "id = \"lane-2-out\"",
                    "polygon = [[0.31, 0.98], [0.69, 0.98], [0.58, 0.10], [0.42, 0.10]]",
                    "heading_deg = 0",
                    "[[webhook]]",
                    "url = \"http://127.0.0.1:" + server.getAddress().getPort() + "/hook\"",
                    "retries = 3",
                    ""));
            ProcessRunner.Result r = ProcessRunner.run(List.of("java", "-jar", ProcessRunner.jar().toString(),
                    "run", "--config", config.toString()), dir, 150);
            assertEquals(0, r.exitCode(), r.stderr());
            assertEquals(2, bodies.size(), "start and end delivered; stderr:\n" + r.stderr());
            Map<String, Object> start = ReplayEndToEndTest.parse(bodies.get(0));
            Map<String, Object> end = ReplayEndToEndTest.parse(bodies.get(1));
            assertEquals("start", start.get("phase"));
            assertEquals("end", end.get("phase"));
            assertEquals(start.get("id"), end.get("id"));
            assertEquals(3, calls.get(), "one failed attempt, then start and end");
            List<String> log = Files.readAllLines(dir.resolve("data/events.jsonl"), StandardCharsets.UTF_8);
            assertEquals(bodies, log, "event log and webhook carry the same records");
        } finally {
            server.stop(0);
        }
    }
}
