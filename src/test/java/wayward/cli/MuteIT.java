package wayward.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.time.Instant;
import java.util.List;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;
import wayward.delivery.Mosquitto;

/**
 * Mutes on the packaged service, with Debian's Mosquitto as the broker: an ACL and three users (the service; an
 * operator allowed to write below its own name in the command topics; a viewer allowed to read only), the
 * looping demo lane (a wrong-way truck 12.3 s into every 26 s loop). The operator mutes the zone over MQTT for
 * the first truck: no wrong-way event for it, the mute expires by itself, the second truck raises one. The
 * viewer's commands (its own topic, and one in the operator's name) are dropped by the broker and change nothing.
 * Then over HTTP (the JDK's client): no token 401, a camera mute with the token, a restart that keeps it, and its
 * early end by the operator over MQTT. Every phase in the event log fits the shipped schema ({@link YardSite#events}).
 */
class MuteIT {
    private static final String TOKEN = "yard-control-room-3";
    private final HttpClient http = HttpClient.newBuilder().connectTimeout(Duration.ofSeconds(5)).build();

    private HttpResponse<String> post(int port, String path, String token, String body) throws Exception {
        HttpRequest.Builder b = HttpRequest.newBuilder(URI.create("http://127.0.0.1:" + port + path))
                .timeout(Duration.ofSeconds(10)).POST(HttpRequest.BodyPublishers.ofString(body));
        if (token != null) {
            b.header("Authorization", "Bearer " + token);
        }
        return http.send(b.build(), HttpResponse.BodyHandlers.ofString());
    }

    private HttpResponse<String> get(int port, String path) throws Exception {
        return http.send(HttpRequest.newBuilder(URI.create("http://127.0.0.1:" + port + path + "?access_token="
                + TOKEN)).timeout(Duration.ofSeconds(10)).build(), HttpResponse.BodyHandlers.ofString());
    }

    private static void publish(Mosquitto m, String user, String password, String topic, String body)
            throws Exception {
        // mosquitto_pub (Debian): QoS 1; a write the ACL forbids is dropped by the broker without telling
        Mosquitto.client(20, "mosquitto_pub", "-h", "127.0.0.1", "-p", Integer.toString(m.port()), "-u", user, "-P",
                password, "-q", "1", "-t", topic, "-m", body);
    }

    private static String awaitLog(Path log, String text, long seconds) throws Exception {
        long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(seconds);
        while (System.nanoTime() < deadline) {
            String t = Files.exists(log) ? Files.readString(log) : "";
            if (t.contains(text)) {
                return t;
            }
            TimeUnit.MILLISECONDS.sleep(100); // polling the log, not a synchronisation sleep
        }
        throw new AssertionError("no \"" + text + "\" within " + seconds + " s:\n"
                + (Files.exists(log) ? Files.readString(log) : ""));
    }

    private static long count(List<Map<String, Object>> events, String kind, String phase) {
        return events.stream().filter(e -> kind.equals(e.get("kind")) && phase.equals(e.get("phase"))).count();
    }

    @Test
    @Timeout(value = 240, unit = TimeUnit.SECONDS)
    void aMuteOverMqttHoldsBackTheFirstTruckAndAMuteOverHttpOutlivesARestart(@TempDir Path dir) throws Exception {
        Path passwords = dir.resolve("passwd");
        Mosquitto.client(20, "mosquitto_passwd", "-b", "-c", passwords.toString(), "wayward", "svc-secret-1");
        Mosquitto.client(20, "mosquitto_passwd", "-b", passwords.toString(), "control-room", "ops-secret-2");
        Mosquitto.client(20, "mosquitto_passwd", "-b", passwords.toString(), "viewer", "view-secret-3");
        Path acl = dir.resolve("acl");
        // Mosquitto's acl_file (mosquitto.conf(5)): per user, the topics it may read and write
        Files.writeString(acl, String.join("\n", "user wayward", "topic readwrite yard/#", "",
                "user control-room", "topic write yard/command/control-room/#", "topic read yard/#", "",
                "user viewer", "topic read yard/#", ""));
        Files.writeString(dir.resolve("mqtt.password"), "svc-secret-1");
        Files.writeString(dir.resolve("control-room.token"), TOKEN);
        int port = Mosquitto.freePort();
        Mosquitto broker = new Mosquitto(dir.resolve("broker"), List.of("password_file " + passwords,
                "acl_file " + acl));
        Process service = null;
        try {
            broker.start();
            Path config = YardSite.looping(dir, "http = \"127.0.0.1:" + port + "\"",
                    "token_file = \"control-room.token\"", "max_mute_hours = 1", "[mqtt]",
                    "url = \"mqtt://127.0.0.1:" + broker.port() + "\"", "topic_prefix = \"yard\"",
                    "client_id = \"wayward-mute-it\"", "username = \"wayward\"", "password_file = \"mqtt.password\"",
                    "commands = true", "[clips]", "enabled = false");
            Path log = dir.resolve("service.log");
            Path events = dir.resolve("data/events.jsonl");
            service = YardSite.startService(dir, config);
            awaitLog(log, "reading operators' commands on yard/command/+/+", 60);

            // the operator mutes the zone for the first truck (12.3 s into the loop); the mute ends by itself
            Instant muted = Instant.now();
            publish(broker, "control-room", "ops-secret-2", "yard/command/control-room/mute",
                    "{\"camera\": \"yard-mast-2\", \"zone\": \"lane-2-out\", \"minutes\": 0.4, "
                            + "\"reason\": \"sweeper in lane 2\"}");
            Map<String, Object> start = YardSite.awaitRecord(events, "zone_muted", "start", 1, 20);
            assertEquals("control-room", start.get("by"), "who: the MQTT user the ACL bound to the topic");
            assertEquals("sweeper in lane 2", start.get("reason"));
            // the viewer may not command: its own topic and the operator's are dropped by the broker
            publish(broker, "viewer", "view-secret-3", "yard/command/viewer/unmute",
                    "{\"camera\": \"yard-mast-2\", \"zone\": \"lane-2-out\"}");
            publish(broker, "viewer", "view-secret-3", "yard/command/control-room/unmute",
                    "{\"camera\": \"yard-mast-2\", \"zone\": \"lane-2-out\"}");
            List<String> state = broker.retained("yard/yard-mast-2/lane-2-out/state", "-u", "viewer", "-P",
                    "view-secret-3");
            assertEquals(1, state.size(), state.toString());
            assertTrue(state.get(0).contains("\"state\":\"muted\"") && state.get(0).contains("\"until\""),
                    "the retained zone state says muted and until when: " + state);

            Map<String, Object> end = YardSite.awaitRecord(events, "zone_muted", "end", 1, 60);
            assertEquals("expired", end.get("ended_by"), "the viewer's unmute changed nothing: " + end);
            double lasted = ((Number) end.get("duration_s")).doubleValue();
            assertEquals(24, lasted, 1.5, "0.4 minutes");
            String text = Files.readString(log);
            assertTrue(text.contains("starts while the zone raises no events (muted or off hours); not raised"),
                    "the first truck was seen and held back: " + text);
            // the second truck, after the mute: raised
            Map<String, Object> wrongWay = YardSite.awaitRecord(events, "wrong_way", "start", 1, 60);
            assertTrue(Instant.parse((String) wrongWay.get("at")).isAfter(Instant.parse((String) end.get("at"))),
                    "the first wrong-way event comes after the mute's end: " + wrongWay);
            assertTrue(Instant.parse((String) wrongWay.get("at")).isAfter(muted.plusSeconds(24)));

            // over HTTP: the token in the header is required, even on loopback
            String body = "{\"camera\": \"yard-mast-2\", \"minutes\": 10, \"reason\": \"camera mast repainted\"}";
            assertEquals(401, post(port, "/api/mutes", null, body).statusCode());
            HttpResponse<String> made = post(port, "/api/mutes", TOKEN, body);
            assertEquals(201, made.statusCode(), made.body());
            YardSite.awaitRecord(events, "camera_muted", "start", 1, 20);

            // a restart keeps the mute: no second start, and it still shows
            service.destroy();
            assertTrue(service.waitFor(30, TimeUnit.SECONDS));
            service = YardSite.startService(dir, config);
            awaitLog(log, "camera yard-mast-2: still muted until", 60);
            long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(30);
            String cameras = "";
            while (System.nanoTime() < deadline && !cameras.contains("yard-mast-2")) {
                try {
                    cameras = get(port, "/api/cameras").body();
                } catch (java.io.IOException notYet) {
                    cameras = "";
                }
                TimeUnit.MILLISECONDS.sleep(200); // the status server starts before the cameras: polling
            }
            assertTrue(cameras.contains("\"reason\":\"camera mast repainted\""), cameras);
            List<Map<String, Object>> all = YardSite.events(events);
            assertEquals(1, count(all, "camera_muted", "start"));
            assertEquals(0, count(all, "camera_muted", "end"), "the restart did not end it: " + all);

            // ended early over MQTT by the operator (the HTTP end is in OpenApiTest)
            awaitLog(log, "reading operators' commands on yard/command/+/+", 60);
            publish(broker, "control-room", "ops-secret-2", "yard/command/control-room/unmute",
                    "{\"camera\": \"yard-mast-2\", \"reason\": \"paint dry\"}");
            Map<String, Object> early = YardSite.awaitRecord(events, "camera_muted", "end", 1, 20);
            assertEquals("control-room", early.get("by"), "who: the MQTT user");
            assertEquals("paint dry", early.get("reason"));
            assertFalse(early.containsKey("ended_by"));
            assertTrue(get(port, "/api/mutes").body().contains("\"mutes\":[]"), "nothing muted now");
            assertEquals(1, count(YardSite.events(events), "zone_muted", "start"), "one mute over MQTT");
        } finally {
            if (service != null) {
                service.destroy();
                service.waitFor(30, TimeUnit.SECONDS);
            }
            broker.close();
        }
    }
}
