package wayward.delivery;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Instant;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.concurrent.TimeUnit;
import java.util.function.Predicate;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;
import wayward.event.Event;
import wayward.event.EventJson;
import wayward.event.EventKind;
import wayward.testing.SchemaCheck;

/**
 * MQTT delivery against a real broker: Debian's Mosquitto 2.0 on loopback, checked with its own command-line
 * client mosquitto_sub (an MQTT 3.1.1 implementation independent of Netty's codec). Topic layout and payloads
 * are ours (README, "MQTT"); retained messages, the will, QoS 1 and sessions behave as MQTT 3.1.1 (OASIS) says.
 */
@Timeout(value = 120, unit = TimeUnit.SECONDS)
class MqttPublisherIT {
    @TempDir
    Path dir;
    private final List<Process> subscribers = new ArrayList<>();
    private final List<Mosquitto> brokers = new ArrayList<>();
    private final List<EventBus> buses = new ArrayList<>();

    @AfterEach
    void cleanUp() throws InterruptedException {
        for (EventBus b : buses) {
            b.close(1000);
        }
        for (Process p : subscribers) {
            p.destroyForcibly();
        }
        for (Mosquitto m : brokers) {
            m.close();
        }
    }

    private Mosquitto broker(String name, String... extra) throws Exception {
        Mosquitto m = new Mosquitto(dir.resolve(name), List.of(extra));
        brokers.add(m);
        return m.start();
    }

    private static Event phase(String id, String zone, Event.Phase phase, double t) {
        return new Event(id, "yard-mast-2", zone, EventKind.WRONG_WAY, phase, t,
                Instant.parse("2026-12-02T10:00:00Z").plusMillis((long) (t * 1000)), 180, 40, 0.05,
                phase == Event.Phase.END ? 2.5 : Double.NaN);
    }

    private static Event camera(String id, EventKind kind, Event.Phase phase, double t) {
        return new Event(id, "yard-mast-2", null, kind, phase, t,
                Instant.parse("2026-12-02T10:00:00Z").plusMillis((long) (t * 1000)), Double.NaN, Double.NaN,
                Double.NaN, phase == Event.Phase.END ? 3 : Double.NaN);
    }

    /** A bus with an outbox and one MQTT destination (short backoffs for the test). */
    private EventBus bus(String outbox, MqttConfig config, List<String> zones) throws IOException {
        EventBus bus = new EventBus();
        Outbox o = Outbox.open(dir.resolve(outbox), 1 << 24, 1 << 20);
        bus.useOutbox(o);
        bus.add(new MqttPublisher(config, zones, o.nextSeq()), 50, 500);
        buses.add(bus);
        return bus;
    }

    private static MqttConfig config(Mosquitto m, String clientId) {
        return new MqttConfig("mqtt://127.0.0.1:" + m.port(), "yard", clientId, null, null, null, 30, null, 16, 1, null, false);
    }

    /** Starts mosquitto_sub printing "topic payload" lines into a file; returns the file. */
    private Path subscribe(Mosquitto m, String filter, String... options) throws Exception {
        Path out = dir.resolve("sub-" + subscribers.size() + ".txt");
        List<String> cmd = new ArrayList<>(List.of("mosquitto_sub", "-h", "127.0.0.1", "-p",
                Integer.toString(m.port()), "-q", "1", "-v", "-t", filter));
        cmd.addAll(List.of(options));
        Process p = new ProcessBuilder(cmd).redirectErrorStream(true).redirectOutput(out.toFile()).start();
        subscribers.add(p);
        // subscribed once the broker's log shows the client (mosquitto logs each new client)
        Thread.sleep(300);
        return out;
    }

    private static List<String> awaitLines(Path file, Predicate<List<String>> done, long seconds) throws Exception {
        long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(seconds);
        List<String> lines = List.of();
        while (System.nanoTime() < deadline) {
            lines = Files.exists(file) ? Files.readAllLines(file) : List.of();
            if (done.test(lines)) {
                return checked(lines);
            }
            Thread.sleep(50);
        }
        return checked(lines);
    }

    /** Every message line seen is held to the schema of its topic (src/main/resources/schema). */
    private static List<String> checked(List<String> lines) {
        for (String l : lines) {
            if (l.startsWith("yard/")) {
                SchemaCheck.assertMqttLine("yard", l);
            }
        }
        return lines;
    }

    @Test
    void phasesArriveOnTheirTopicsAndStateAndStatusAreRetained() throws Exception {
        Mosquitto m = broker("b");
        Path events = subscribe(m, "yard/+/+/event");
        Path cameraEvents = subscribe(m, "yard/+/event");
        EventBus bus = bus("outbox", config(m, "wayward-test-1"),
                List.of("yard-mast-2/lane-2-out", "yard-mast-2/lane-1-in", "yard-mast-2/staff-door"));
        Event aStart = phase("a1", "lane-2-out", Event.Phase.START, 12.3);
        Event aEnd = phase("a1", "lane-2-out", Event.Phase.END, 14.8);
        Event bStart = phase("b1", "lane-1-in", Event.Phase.START, 13.0);
        Event lost = camera("o1", EventKind.CAMERA_LOST, Event.Phase.START, 20);
        // two tamper conditions overlap; the end of one leaves the other in the retained camera state
        Event focus = camera("f1", EventKind.FOCUS_LOST, Event.Phase.START, 21);
        Event blocked = camera("v1", EventKind.VIEW_BLOCKED, Event.Phase.START, 22);
        Event unblocked = camera("v1", EventKind.VIEW_BLOCKED, Event.Phase.END, 25);
        for (Event e : List.of(aStart, bStart, aEnd, lost, focus, blocked, unblocked)) {
            bus.publish(e);
        }
        List<String> got = awaitLines(events, l -> l.size() >= 3, 20);
        assertEquals(List.of(
                "yard/yard-mast-2/lane-2-out/event " + EventJson.toJson(aStart),
                "yard/yard-mast-2/lane-1-in/event " + EventJson.toJson(bStart),
                "yard/yard-mast-2/lane-2-out/event " + EventJson.toJson(aEnd)), got);
        assertEquals(List.of(lost, focus, blocked, unblocked).stream()
                .map(e -> "yard/yard-mast-2/event " + EventJson.toJson(e)).toList(),
                awaitLines(cameraEvents, l -> l.size() >= 4, 20));

        List<String> retained = checked(awaitRetained(m, "yard/#",
                l -> l.size() >= 5 && l.stream().anyMatch(x -> x.contains("\"event\":\"v1\"")), 20));
        Map<String, String> byTopic = new LinkedHashMap<>();
        for (String l : retained) {
            byTopic.put(l.substring(0, l.indexOf(' ')), l.substring(l.indexOf(' ') + 1));
        }
        assertEquals(Set.of("yard/yard-mast-2/lane-2-out/state", "yard/yard-mast-2/lane-1-in/state",
                "yard/yard-mast-2/staff-door/state", "yard/yard-mast-2/state", "yard/status/wayward-test-1"),
                byTopic.keySet(), retained.toString());
        assertTrue(byTopic.get("yard/yard-mast-2/lane-1-in/state").contains("\"state\":\"alert\",\"event\":\"b1\""));
        assertTrue(byTopic.get("yard/yard-mast-2/lane-2-out/state").contains("\"state\":\"clear\",\"event\":\"a1\""));
        assertTrue(byTopic.get("yard/yard-mast-2/staff-door/state").contains("\"state\":\"clear\""),
                "a zone without events is cleared once the backlog is out");
        assertTrue(byTopic.get("yard/yard-mast-2/state").startsWith("{\"state\":\"lost\",\"conditions\":[\"focus_lost\"],"
                + "\"event\":\"v1\",\"kind\":\"view_blocked\",\"phase\":\"end\""), byTopic.get("yard/yard-mast-2/state"));
        assertTrue(byTopic.get("yard/status/wayward-test-1").contains("\"state\":\"online\""));
        assertTrue(retained.stream().noneMatch(l -> l.contains("/event ")), "event phases are not retained");

        bus.close(5000); // a clean stop publishes the offline status itself
        buses.remove(bus);
        List<String> after = checked(m.retained("yard/status/+"));
        assertEquals(1, after.size(), after.toString());
        assertTrue(after.get(0).contains("\"state\":\"offline\""), after.toString());
    }

    private static List<String> awaitRetained(Mosquitto m, String filter, Predicate<List<String>> done, long seconds)
            throws Exception {
        long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(seconds);
        List<String> l = m.retained(filter);
        while (!done.test(l) && System.nanoTime() < deadline) {
            Thread.sleep(200);
            l = m.retained(filter);
        }
        return l;
    }

    @Test
    void aBurstDuringABrokerOutageArrivesCompleteAndInOrderPerZone() throws Exception {
        Mosquitto m = broker("b");
        // a persistent session (clean session 0) for the checking client: the broker queues its QoS 1
        // messages while it is away and keeps them across its own restart (persistence on)
        Mosquitto.client(10, "mosquitto_sub", "-h", "127.0.0.1", "-p", Integer.toString(m.port()), "-c", "-i",
                "yard-checker", "-q", "1", "-t", "yard/+/+/event", "-W", "1");
        EventBus bus = bus("outbox", config(m, "wayward-test-2"), List.of());
        bus.publish(phase("warm", "lane-0", Event.Phase.START, 0));
        m.stop();
        List<String> expected = new ArrayList<>();
        String[] zones = {"lane-1", "lane-2", "lane-3", "lane-4"};
        for (int i = 0; i < 200; i++) {
            String zone = zones[i % 4];
            Event e = phase("burst-" + i, zone, i / 4 % 2 == 0 ? Event.Phase.START : Event.Phase.END, i * 0.1);
            bus.publish(e);
            expected.add(zone + " " + e.id() + " " + e.phase().jsonName());
        }
        Thread.sleep(2000); // the outage lasts; the publisher keeps trying
        m.start();
        Path out = dir.resolve("checker.txt");
        Process p = new ProcessBuilder("mosquitto_sub", "-h", "127.0.0.1", "-p", Integer.toString(m.port()), "-c",
                "-i", "yard-checker", "-q", "1", "-t", "yard/+/+/event", "-v")
                .redirectErrorStream(true).redirectOutput(out.toFile()).start();
        subscribers.add(p);
        List<String> got = awaitLines(out, l -> distinct(l).containsAll(expected), 60);
        Set<String> seen = distinct(got);
        assertTrue(seen.containsAll(expected), "missing: " + missing(expected, seen) + "\nbroker log:\n" + m.log());
        for (String zone : zones) {
            List<String> want = expected.stream().filter(s -> s.startsWith(zone + " ")).toList();
            List<String> order = new ArrayList<>(new LinkedHashSet<>(firstSeen(got, zone)));
            assertEquals(want, order, "order in " + zone);
        }
    }

    /** "zone id phase" of every event line (duplicates of an at-least-once delivery collapse). */
    private static Set<String> distinct(List<String> lines) {
        Set<String> s = new LinkedHashSet<>();
        for (String l : lines) {
            int sp = l.indexOf(' ');
            if (sp < 0 || !l.startsWith("yard/")) {
                continue;
            }
            String[] topic = l.substring(0, sp).split("/");
            Event e = EventJson.parse(l.substring(sp + 1).getBytes(StandardCharsets.UTF_8));
            s.add(topic[2] + " " + e.id() + " " + e.phase().jsonName());
        }
        return s;
    }

    private static List<String> firstSeen(List<String> lines, String zone) {
        return distinct(lines).stream().filter(s -> s.startsWith(zone + " ")).toList();
    }

    private static List<String> missing(List<String> expected, Set<String> seen) {
        return expected.stream().filter(e -> !seen.contains(e)).limit(10).toList();
    }

    @Test
    void aRefusedLoginIsOneClearLogLineAndTheRightPasswordDelivers() throws Exception {
        Path passwords = dir.resolve("passwd");
        Mosquitto.client(20, "mosquitto_passwd", "-b", "-c", passwords.toString(), "wayward", "yard-secret-9");
        Mosquitto m = broker("b", "password_file " + passwords);
        Path events = subscribe(m, "yard/+/+/event", "-u", "wayward", "-P", "yard-secret-9");
        try (LogCapture log = new LogCapture(MqttPublisher.class)) {
            EventBus wrong = bus("outbox-1", config(m, "wayward-test-3").withLogin("wayward",
                    "not-the-password".getBytes(StandardCharsets.UTF_8)), List.of());
            wrong.publish(phase("p1", "lane-2-out", Event.Phase.START, 1));
            long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(20);
            while (log.lines().stream().noneMatch(l -> l.contains("refused")) && System.nanoTime() < deadline) {
                Thread.sleep(50);
            }
            Thread.sleep(1500); // several more attempts with backoff: still one line
            wrong.close(500);
            buses.remove(wrong);
            List<String> refused = log.lines().stream().filter(l -> l.contains("refused")).toList();
            assertEquals(1, refused.size(), log.lines().toString());
            // Mosquitto answers a wrong password with CONNACK 5, "not authorised" (MQTT 3.1.1 §3.2.2.3)
            assertTrue(refused.get(0).startsWith("WARN mqtt mqtt://127.0.0.1:" + m.port()
                    + ": broker refused the connection: not authorised for user 'wayward' (CONNACK code 5)"),
                    refused.get(0));
        }
        EventBus right = bus("outbox-2", config(m, "wayward-test-3").withLogin("wayward",
                "yard-secret-9".getBytes(StandardCharsets.UTF_8)), List.of());
        right.publish(phase("p2", "lane-2-out", Event.Phase.START, 2));
        List<String> got = awaitLines(events, l -> !l.isEmpty(), 20);
        assertEquals(1, got.size(), got.toString());
        assertTrue(got.get(0).contains("\"id\":\"p2\""));
    }

    @Test
    void tlsWithATestCaDeliversAndAnUntrustedBrokerIsNamedInTheLog() throws Exception {
        TestCa ca = new TestCa(dir.resolve("ca"));
        Mosquitto m = broker("b", "cafile " + ca.caPem, "certfile " + ca.serverPem, "keyfile " + ca.serverKey);
        Path events = subscribe(m, "yard/+/+/event", "--cafile", ca.caPem.toString(), "-h", "localhost");
        MqttConfig tls = new MqttConfig("mqtts://localhost:" + m.port(), "yard", "wayward-test-4", null, null, null,
                30, ca.caPem.toString(), 16, 1, null, false);
        bus("outbox-1", tls, List.of()).publish(phase("t1", "lane-2-out", Event.Phase.START, 1));
        List<String> got = awaitLines(events, l -> !l.isEmpty(), 20);
        assertEquals(1, got.size(), got + "\n" + m.log());
        assertTrue(got.get(0).startsWith("yard/yard-mast-2/lane-2-out/event {\"schema\":1,\"id\":\"t1\""), got.get(0));

        try (LogCapture log = new LogCapture(MqttPublisher.class)) {
            MqttConfig untrusted = new MqttConfig("mqtts://localhost:" + m.port(), "yard", "wayward-test-5", null,
                    null, null, 30, null, 16, 1, null, false);
            EventBus b = bus("outbox-2", untrusted, List.of());
            b.publish(phase("t2", "lane-2-out", Event.Phase.START, 2));
            long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(20);
            while (log.lines().stream().noneMatch(l -> l.startsWith("WARN")) && System.nanoTime() < deadline) {
                Thread.sleep(50);
            }
            String line = log.lines().stream().filter(l -> l.startsWith("WARN")).findFirst().orElse("none");
            assertTrue(line.toLowerCase(java.util.Locale.ROOT).contains("certification path") || line.toLowerCase(java.util.Locale.ROOT).contains("certificate"),
                    line);
        }
    }

    /**
     * Mute records are retained state read at QoS 0: on connecting, every record the broker retained reaches the
     * mutes before they are told they caught up, also beyond Mosquitto's in-flight window (max_inflight_messages,
     * 20 by default), which holds back QoS 1 deliveries but not QoS 0 ones; a later record comes after.
     */
    @Test
    void everyRetainedMuteRecordComesBeforeCaughtUp() throws Exception {
        Mosquitto m = broker("mutes");
        int retained = 40;
        for (int i = 0; i < retained; i++) {
            Mosquitto.client(10, "mosquitto_pub", "-h", "127.0.0.1", "-p", Integer.toString(m.port()), "-q", "1",
                    "-r", "-t", "yard/mutes/cam-" + i, "-m", "{\"n\":" + i + "}");
        }
        List<String> told = java.util.Collections.synchronizedList(new ArrayList<>());
        MqttPublisher.MuteRecords records = new MqttPublisher.MuteRecords() {
            @Override
            public void subscribing() {
                told.add("subscribing");
            }

            @Override
            public void record(byte[] json) {
                told.add(new String(json, StandardCharsets.UTF_8));
            }

            @Override
            public void caughtUp() {
                told.add("caught up");
            }
        };
        MqttPublisher p = new MqttPublisher(config(m, "yard-north"), List.of(), 1, null, null, records);
        try {
            long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(20);
            while (!told.contains("caught up") && System.nanoTime() < deadline) {
                Thread.sleep(20);
            }
            assertEquals("subscribing", told.get(0));
            assertEquals(retained + 1, told.indexOf("caught up"), "every retained record first: " + told);
            Mosquitto.client(10, "mosquitto_pub", "-h", "127.0.0.1", "-p", Integer.toString(m.port()), "-q", "1",
                    "-r", "-t", "yard/mutes/cam-live", "-m", "{\"n\":\"live\"}");
            deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(10);
            while (!told.contains("{\"n\":\"live\"}") && System.nanoTime() < deadline) {
                Thread.sleep(20);
            }
            assertEquals(retained + 3, told.size(), told.toString());
            assertEquals("{\"n\":\"live\"}", told.get(retained + 2));
        } finally {
            p.close();
        }
    }
}
