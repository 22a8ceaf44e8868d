package wayward.service;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;
import wayward.analysis.CameraConfig;
import wayward.config.ConfigLoader;
import wayward.event.Event;
import wayward.event.EventJson;
import wayward.event.EventKind;
import wayward.http.MuteControl;
import wayward.testing.SchemaCheck;
import wayward.testing.SteppingClock;

/**
 * Mutes on a clock the test moves: the gate closes for the muted zone (and all zones of a muted camera), a mute
 * ends by itself at its time (ended_by expired), early by an operator, survives a restart with the same event id,
 * ends at the start after it expired meanwhile; the bound and the unknown names are refused. Each phase is held to
 * the shipped event schema.
 */
@Timeout(value = 30, unit = TimeUnit.SECONDS)
class MutesTest {
    private static final Instant T0 = Instant.parse("2026-12-03T08:00:00Z");

    @TempDir
    Path dir;

    private final SteppingClock clock = new SteppingClock(T0);
    private final List<Event> events = Collections.synchronizedList(new ArrayList<>());

    private List<CameraConfig> cameras(String... zones) throws Exception {
        StringBuilder toml = new StringBuilder("[[camera]]\nid = \"gate-in\"\nsource = \"rtsp://cam.yard.example/s\"\n");
        for (String z : zones) {
            toml.append("[[camera.zone]]\nid = \"").append(z).append("\"\n")
                    .append("polygon = [[0.1, 0.1], [0.9, 0.1], [0.5, 0.9]]\nheading_deg = 0\n");
        }
        Path f = dir.resolve("site.toml");
        Files.writeString(f, toml);
        return ConfigLoader.load(f).cameras();
    }

    private Mutes open(List<CameraConfig> cams) {
        return new Mutes(dir.resolve("data"), cams, Duration.ofHours(12), clock, e -> {
            // every phase the mutes raise fits the shipped event schema
            SchemaCheck.assertEventRecord(EventJson.toJson(e));
            events.add(e);
        });
    }

    private void awaitEvents(int n) throws InterruptedException {
        long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(5);
        while (events.size() < n && System.nanoTime() < deadline) {
            TimeUnit.MILLISECONDS.sleep(20); // the timer checks once a second
        }
        assertEquals(n, events.size(), events.toString());
    }

    @Test
    void aZoneMuteClosesOnlyThatZoneAndEndsByItself() throws Exception {
        try (Mutes m = open(cameras("lane-1", "lane-2"))) {
            m.mute("gate-in", "lane-1", T0.plusSeconds(600), "control-room", "sweeper\nin lane 1");
            assertFalse(m.raises("gate-in", "lane-1", T0.plusSeconds(10)));
            assertTrue(m.raises("gate-in", "lane-2", T0.plusSeconds(10)), "the other zone still raises");
            assertTrue(m.raises("gate-in", "lane-1", T0.plusSeconds(600)), "the end time itself is open");
            Event start = events.get(0);
            assertEquals(EventKind.ZONE_MUTED, start.kind());
            assertEquals("lane-1", start.zone());
            assertEquals(new Event.Control(T0.plusSeconds(600), "control-room", "sweeper in lane 1"), start.control(),
                    "until, by and a reason on one line");

            clock.step(601);
            awaitEvents(2);
            Event end = events.get(1);
            assertEquals(start.id(), end.id());
            assertEquals(Event.Phase.END, end.phase());
            assertEquals(Event.EXPIRED, end.endedBy());
            assertNull(end.control().by());
            assertEquals(601, end.durationSeconds(), 1e-9);
            assertTrue(m.mutes().isEmpty());
        }
    }

    @Test
    void aCameraMuteClosesAllItsZonesAndEndsEarlyByName() throws Exception {
        try (Mutes m = open(cameras("lane-1", "lane-2"))) {
            m.mute("gate-in", null, T0.plusSeconds(3600), "yard-ops", "");
            assertFalse(m.raises("gate-in", "lane-1", T0));
            assertFalse(m.raises("gate-in", "lane-2", T0));
            assertEquals(EventKind.CAMERA_MUTED, events.get(0).kind());
            clock.step(120);
            m.unmute("gate-in", null, "control-room", "done early");
            assertTrue(m.raises("gate-in", "lane-1", clock.instant()));
            Event end = events.get(1);
            assertEquals("control-room", end.control().by());
            assertEquals("done early", end.control().reason());
            assertNull(end.endedBy());
            MuteControl.Refused again = assertThrows(MuteControl.Refused.class,
                    () -> m.unmute("gate-in", null, "control-room", ""));
            assertEquals("camera gate-in is not muted", again.getMessage());
        }
    }

    @Test
    void aMuteOutlivesARestartAndOneThatEndedMeanwhileEndsAtTheStart() throws Exception {
        List<CameraConfig> cams = cameras("lane-1", "lane-2");
        String id;
        try (Mutes m = open(cams)) {
            m.mute("gate-in", "lane-1", T0.plusSeconds(600), "control-room", "kerb works");
            m.mute("gate-in", "lane-2", T0.plusSeconds(60), "control-room", "short");
            id = events.get(0).id();
        }
        events.clear();
        clock.step(300);
        try (Mutes m = open(cams)) {
            // lane-2's end time passed while the service was down: it ends now; lane-1 holds, no new start
            assertEquals(1, events.size(), events.toString());
            assertEquals(Event.EXPIRED, events.get(0).endedBy());
            assertEquals("lane-2", events.get(0).zone());
            assertFalse(m.raises("gate-in", "lane-1", clock.instant()));
            assertEquals(1, m.mutes().size());
            m.unmute("gate-in", "lane-1", "control-room", "");
            assertEquals(id, events.get(1).id(), "the end carries the id of the start before the restart");
        }
    }

    @Test
    void theBoundUnknownNamesAndThePastAreRefusedAndAZoneThatLeftTheConfigEnds() throws Exception {
        try (Mutes m = open(cameras("lane-1"))) {
            assertEquals("the end 2026-12-03T20:00:01Z is more than 12.0 h away (max_mute_hours); a mute always ends "
                    + "by itself", assertThrows(MuteControl.Refused.class, () -> m.mute("gate-in", "lane-1",
                    T0.plusSeconds(12 * 3600 + 1), "a", "")).getMessage());
            assertTrue(assertThrows(MuteControl.Refused.class, () -> m.mute("gate-in", "lane-1", T0, "a", ""))
                    .getMessage().contains("not in the future"));
            assertEquals("camera gate-in has no zone lane-9 (expected one of lane-1)", assertThrows(
                    MuteControl.Refused.class, () -> m.mute("gate-in", "lane-9", T0.plusSeconds(60), "a", ""))
                    .getMessage());
            assertEquals("no camera dock in the config (expected one of gate-in)", assertThrows(MuteControl.Refused.class,
                    () -> m.mute("dock", null, T0.plusSeconds(60), "a", "")).getMessage());
            assertTrue(events.isEmpty(), "nothing raised for a refusal");
            m.mute("gate-in", "lane-1", T0.plusSeconds(60), "a", "");
            m.configChanged(cameras("lane-2"));
            assertEquals(2, events.size());
            assertEquals("its zone left the config", events.get(1).control().reason());
        }
    }

    /** A broker's retained messages (MQTT 3.1.1 §3.3.1.3): the last record per topic, delivered to each instance. */
    private static final class Retained {
        final java.util.Map<String, byte[]> last = new java.util.TreeMap<>();
        final List<byte[]> pending = new ArrayList<>();

        Mutes.Share to() {
            return (camera, zone, record) -> {
                // each record fits the shipped schema of its topic
                SchemaCheck.assertMqttPayload("yard", "yard/mutes/" + camera + (zone == null ? "" : "/" + zone),
                        new String(record, java.nio.charset.StandardCharsets.UTF_8));
                last.put(camera + "/" + zone, record);
                pending.add(record);
            };
        }

        /** Delivers what was sent since the last call to every instance (each gets its own back, as from a broker). */
        void deliver(Mutes... to) {
            List<byte[]> now = List.copyOf(pending);
            pending.clear();
            for (byte[] r : now) {
                for (Mutes m : to) {
                    m.mirror(r);
                }
            }
        }
    }

    /** A Share whose records never reach a broker: the publish in flight died with its process. */
    private static final Mutes.Share LOST = (camera, zone, record) -> { };

    /** What a (re)connecting instance is told (MqttPublisher.MuteRecords): the retained records, then caught up. */
    private static void subscribe(Retained broker, Mutes m) {
        m.subscribing();
        broker.last.values().forEach(m::mirror);
        m.caughtUp();
    }

    private Mutes open(String instance, List<CameraConfig> cams, List<Event> raised) {
        return new Mutes(dir.resolve(instance), cams, Duration.ofHours(12), clock, e -> {
            SchemaCheck.assertEventRecord(EventJson.toJson(e));
            raised.add(e);
        });
    }

    /** Two instances' mutes, north and south, each passing its changes to the same retained stand-in. */
    private final class Two implements AutoCloseable {
        final Retained broker = new Retained();
        final List<Event> northRaised = Collections.synchronizedList(new ArrayList<>());
        final List<Event> southRaised = Collections.synchronizedList(new ArrayList<>());
        final Mutes north;
        final Mutes south;

        Two(List<CameraConfig> cams) {
            north = open("north", cams, northRaised);
            south = open("south", cams, southRaised);
            north.shareWith(broker.to());
            south.shareWith(broker.to());
        }

        @Override
        public void close() {
            north.close();
            south.close();
        }
    }

    @Test
    void aMuteAskedOfOneInstanceHoldsOnTheOneWatchingAndAfterTheCameraMoves() throws Exception {
        try (Two two = new Two(cameras("lane-1"))) {
            Mutes n = two.north;
            Mutes s = two.south;
            List<Event> north = two.northRaised;
            List<Event> south = two.southRaised;
            Retained broker = two.broker;
            // south watches gate-in; the operator's request reached north (a load balancer, another desk)
            n.raiseOnlyFor(c -> false);
            s.raiseOnlyFor(c -> true);
            n.mute("gate-in", "lane-1", T0.plusSeconds(900), "control-room", "sweeper");
            broker.deliver(n, s);
            assertFalse(s.raises("gate-in", "lane-1", T0.plusSeconds(60)), "the watching instance holds the mute");
            assertEquals(0, north.size(), "north does not watch gate-in: raises nothing");
            assertEquals(1, south.size());
            Event start = south.get(0);
            assertEquals(EventKind.ZONE_MUTED, start.kind());
            assertEquals("control-room", start.control().by());
            assertEquals(n.mutes().get(0), s.mutes().get(0), "the same mute: since, until, by, reason");

            // south dies; gate-in moves to north, which knew the mute all along and ends it at its time
            n.raiseOnlyFor(c -> true);
            clock.step(900);
            long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(5);
            while (north.isEmpty() && System.nanoTime() < deadline) {
                TimeUnit.MILLISECONDS.sleep(20); // the timer checks once a second
            }
            assertEquals(1, north.size(), north.toString());
            assertEquals(start.id(), north.get(0).id(), "the end carries the start's id, though another raised it");
            assertEquals(Event.EXPIRED, north.get(0).endedBy());
        }
    }

    @Test
    void anEarlyEndAndANewerMuteArePassedOnAndOldOrForeignRecordsChangeNothing() throws Exception {
        try (Two two = new Two(cameras("lane-1"))) {
            Mutes n = two.north;
            Mutes s = two.south;
            List<Event> south = two.southRaised;
            Retained broker = two.broker;
            n.raiseOnlyFor(c -> false);
            n.mute("gate-in", null, T0.plusSeconds(600), "control-room", "camera cleaned");
            broker.deliver(n, s);
            clock.step(10);
            s.mute("gate-in", null, T0.plusSeconds(1200), "night-desk", "longer");
            broker.deliver(n, s);
            assertEquals(T0.plusSeconds(1200), n.mutes().get(0).until(), "the newer mute replaces the older");
            assertEquals(s.mutes(), n.mutes());
            // a record read late (an older mute of the same camera) does not undo the newer one
            byte[] older = broker.last.get("gate-in/null");
            s.unmute("gate-in", null, "night-desk", "done early");
            broker.deliver(n, s);
            assertTrue(n.mutes().isEmpty(), "the early end is passed on");
            assertTrue(s.mutes().isEmpty());
            assertEquals(Event.Phase.END, south.get(south.size() - 1).phase());
            assertEquals("done early", south.get(south.size() - 1).control().reason());
            n.mirror(older); // the ended record replaced it at the broker; an old copy arriving late
            assertTrue(n.mutes().isEmpty(), "a mute ended here does not start again from a late copy");
            // records that are not ours: unreadable, a camera of another config, a mute already over
            int before = south.size();
            s.mirror("not json".getBytes(java.nio.charset.StandardCharsets.UTF_8));
            s.mirror(("{\"state\":\"muted\",\"id\":\"x\",\"camera\":\"dock-7\",\"since\":\"" + T0
                    + "\",\"until\":\"" + T0.plusSeconds(900) + "\",\"by\":\"a\",\"reason\":\"\"}")
                    .getBytes(java.nio.charset.StandardCharsets.UTF_8));
            s.mirror(("{\"state\":\"muted\",\"id\":\"y\",\"camera\":\"gate-in\",\"since\":\"" + T0
                    + "\",\"until\":\"" + T0.plusSeconds(5) + "\",\"by\":\"a\",\"reason\":\"\"}")
                    .getBytes(java.nio.charset.StandardCharsets.UTF_8));
            assertTrue(s.mutes().isEmpty());
            assertEquals(before, south.size());
            // an MQTT command reaches every instance itself: nothing is passed on
            broker.pending.clear();
            s.unshared().mute("gate-in", "lane-1", T0.plusSeconds(300), "night-desk", "by command");
            assertTrue(broker.pending.isEmpty());
        }
    }

    @Test
    void aMuteAskedWhileTheBrokerWasAwayIsPassedOnWhenItsInstanceComesBackAfterDying() throws Exception {
        Retained broker = new Retained();
        List<Event> northRaised = new ArrayList<>();
        List<Event> southRaised = new ArrayList<>();
        Mutes north = open("north", cameras("lane-1"), northRaised);
        north.shareWith(LOST); // the broker is away; the process dies before it comes back
        north.mute("gate-in", "lane-1", T0.plusSeconds(900), "control-room", "sweeper");
        north.unshared().mute("gate-in", null, T0.plusSeconds(600), "night-desk", "by command");
        String id = northRaised.get(0).id(); // the zone's mute start
        north.close();
        try (Mutes south = open("south", cameras("lane-1"), southRaised);
                Mutes again = open("north", cameras("lane-1"), northRaised)) {
            south.shareWith(broker.to());
            again.shareWith(broker.to());
            subscribe(broker, south);
            subscribe(broker, again);
            assertEquals(1, broker.pending.size(), "the mute asked here is passed on; the MQTT command's is not");
            broker.deliver(south, again);
            assertEquals(1, south.mutes().size());
            assertEquals("lane-1", south.mutes().get(0).zone());
            assertEquals(id, southRaised.get(0).id(), "the same mute, under its id");
            // connected again later: the broker holds it now, so nothing is sent twice
            subscribe(broker, again);
            assertTrue(broker.pending.isEmpty(), "held by the broker: not sent again");
        }
    }

    @Test
    void aMuteEndedElsewhereWhileItsInstanceWasDownDoesNotComeBack() throws Exception {
        try (Two two = new Two(cameras("lane-1"))) {
            two.north.mute("gate-in", "lane-1", T0.plusSeconds(900), "control-room", "sweeper");
            two.broker.deliver(two.north, two.south);
            two.north.close(); // north stops; south ends the mute early, the broker keeps the ended record
            two.south.unmute("gate-in", "lane-1", "night-desk", "sweeper gone");
            two.broker.deliver(two.south);
            List<Event> raised = new ArrayList<>();
            try (Mutes again = open("north", cameras("lane-1"), raised)) {
                again.shareWith(two.broker.to());
                assertEquals(1, again.mutes().size(), "north's file still holds it");
                subscribe(two.broker, again);
                assertTrue(again.mutes().isEmpty(), "the broker's ended record ends it");
                assertTrue(two.broker.pending.isEmpty(), "and it is not passed on again");
                assertEquals("ended", new String(two.broker.last.get("gate-in/lane-1"),
                        java.nio.charset.StandardCharsets.UTF_8).replaceAll(".*\"state\":\"(\\w+)\".*", "$1"));
            }
        }
    }

    @Test
    void anUnreadableFileIsSetAsideAndNothingIsMuted() throws Exception {
        Files.createDirectories(dir.resolve("data"));
        Files.writeString(dir.resolve("data").resolve(Mutes.FILE), "[{\"camera\": ");
        try (Mutes m = open(cameras("lane-1"))) {
            assertTrue(m.mutes().isEmpty());
            assertTrue(Files.exists(dir.resolve("data").resolve(Mutes.FILE + ".bad")));
            assertTrue(m.raises("gate-in", "lane-1", T0));
        }
    }
}
