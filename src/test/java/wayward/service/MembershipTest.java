package wayward.service;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.time.Clock;
import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import java.util.TreeSet;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;

/**
 * Three instances' membership fed the statuses a broker would deliver (MQTT 3.1.1: retained statuses after the
 * SUBACK, the will's offline when an instance dies): the cameras of an instance gone offline go to the others and
 * come back, every camera has exactly one watcher in steady state, each move is announced once, and an instance
 * that lost the broker keeps its cameras and takes no others. The expected owners come from {@link Shards}
 * over the online names (rendezvous hashing, Thaler and Ravishankar 1998).
 */
@Timeout(value = 60, unit = TimeUnit.SECONDS)
class MembershipTest {
    private static final List<String> NAMES = List.of("north", "south", "gate");
    private static final int KEEP_ALIVE = 2;
    private static final double RECONNECT_GRACE = 4;
    private final List<String> cameras = new ArrayList<>();
    private final Map<String, Membership> members = new TreeMap<>();
    private final Map<String, List<String>> watched = new TreeMap<>();
    private final List<String> announced = Collections.synchronizedList(new ArrayList<>());

    MembershipTest() {
        for (int i = 1; i <= 30; i++) {
            cameras.add("yard-mast-" + i);
        }
        for (String n : NAMES) {
            watched.put(n, Shards.mine(cameras, n, NAMES));
            members.put(n, new Membership(n, NAMES, cameras, KEEP_ALIVE, RECONNECT_GRACE,
                    ids -> watched.put(n, List.copyOf(ids)),
                    (camera, from, to, reason) -> announced.add(n + ": " + camera + " " + from + ">" + to + " "
                            + reason), Clock.systemUTC()));
        }
    }

    /** Instances whose status the broker delivers again once a second (each refreshes it once a keep-alive). */
    private final java.util.Set<String> alive = java.util.concurrent.ConcurrentHashMap.newKeySet();
    /** Instances connected to the broker: they get the refreshed statuses. */
    private final java.util.Set<String> connected = java.util.concurrent.ConcurrentHashMap.newKeySet();
    private final java.util.concurrent.ScheduledExecutorService broker =
            java.util.concurrent.Executors.newSingleThreadScheduledExecutor();

    {
        broker.scheduleWithFixedDelay(() -> {
            for (String to : connected) {
                for (String i : alive) {
                    members.get(to).status(i, true);
                }
            }
        }, 1, 1, TimeUnit.SECONDS);
    }

    @AfterEach
    void close() {
        broker.shutdownNow();
        members.values().forEach(Membership::close);
    }

    /** What a broker delivers to every live instance: {@code instance}'s status. */
    private void status(String instance, boolean online, String... to) throws Exception {
        for (String n : to) {
            members.get(n).status(instance, online);
        }
        for (String n : to) {
            members.get(n).drain();
        }
    }

    private void subscribeAndSettle(String n, String... onlineOthers) throws Exception {
        Membership m = members.get(n);
        m.subscribed();
        connected.add(n);
        for (String o : onlineOthers) {
            m.status(o, true);
        }
        long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(10);
        while (!m.view().brokerConnected() && System.nanoTime() < deadline) {
            TimeUnit.MILLISECONDS.sleep(20); // polling the settle time, not a synchronisation sleep
        }
        assertTrue(m.view().brokerConnected(), n + " settled");
        m.drain();
    }

    /** Waits until {@code n} watches {@code expected} (a move waits out the offline grace). */
    private void awaitWatched(String n, List<String> expected) throws Exception {
        long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(10);
        while (!expected.equals(watched.get(n)) && System.nanoTime() < deadline) {
            TimeUnit.MILLISECONDS.sleep(20); // polling the membership thread's decisions
        }
        assertEquals(expected, watched.get(n), n);
    }

    private void assertEachCameraOnce(String... live) {
        List<String> all = new ArrayList<>();
        for (String n : live) {
            all.addAll(watched.get(n));
            assertEquals(watched.get(n), members.get(n).watching(), n + ": what it started is what it says");
        }
        assertEquals(cameras.size(), all.size(), "no camera watched twice: " + watched);
        assertEquals(new TreeSet<>(cameras), new TreeSet<>(all), "every camera watched: " + watched);
    }

    @Test
    void anInstanceThatDiesLosesItsCamerasToTheOthersAndGetsThemBack() throws Exception {
        List<String> southShare = Shards.mine(cameras, "south", NAMES);
        alive.addAll(NAMES);
        subscribeAndSettle("north", "south", "gate");
        subscribeAndSettle("gate", "north", "south");
        subscribeAndSettle("south", "north", "gate");
        assertEachCameraOnce("north", "south", "gate");
        assertTrue(announced.isEmpty(), "all online: nothing moved " + announced);

        // south's will: after the grace north and gate take exactly its cameras, each hashed over the two left
        long t0 = System.nanoTime();
        alive.remove("south");
        connected.remove("south");
        status("south", false, "north", "gate");
        assertEquals(Shards.mine(cameras, "north", NAMES), watched.get("north"), "not at once: the grace first");
        List<String> two = List.of("north", "gate");
        awaitWatched("north", Shards.mine(cameras, "north", two));
        awaitWatched("gate", Shards.mine(cameras, "gate", two));
        assertTrue(System.nanoTime() - t0 >= TimeUnit.MILLISECONDS.toNanos(Membership.OFFLINE_GRACE_MILLIS),
                "moved after the grace");
        assertEachCameraOnce("north", "gate");
        for (String c : southShare) {
            String to = Shards.owner(c, List.of("north", "gate"));
            assertTrue(watched.get(to).contains(c), c + " went to " + to);
        }
        assertEquals(southShare.size(), announced.size(), "each move announced once: " + announced);
        for (String a : announced) {
            assertTrue(a.contains(" south>") && a.endsWith("south went offline")
                    && a.startsWith(a.substring(a.indexOf('>') + 1, a.indexOf(' ', a.indexOf('>'))) + ":"),
                    "announced by the instance that took it: " + a);
        }
        for (String n : List.of("north", "gate")) {
            assertTrue(watched.get(n).containsAll(Shards.mine(cameras, n, NAMES)), n + " kept its own cameras");
            assertEquals(southShare.size(), members.get(n).view().moves());
        }

        // south is back: north and gate hand its cameras back, announced once each by the one handing back
        announced.clear();
        alive.add("south");
        status("south", true, "north", "gate");
        assertEquals(Shards.mine(cameras, "north", NAMES), watched.get("north"));
        assertEquals(Shards.mine(cameras, "gate", NAMES), watched.get("gate"));
        assertEquals(southShare.size(), announced.size(), "each hand-back announced once: " + announced);
        for (String a : announced) {
            assertTrue(a.contains(">south ") && a.endsWith("south came online") && a.startsWith(a.substring(
                    a.indexOf(' ') + 1).split(" ")[1].split(">")[0] + ":"), "announced by the one handing back: " + a);
        }
    }

    @Test
    void anInstanceThatLostTheBrokerKeepsItsCamerasAndTakesNoOthers() throws Exception {
        alive.add("gate");
        subscribeAndSettle("north", "south", "gate");
        status("south", false, "north");
        awaitWatched("north", Shards.mine(cameras, "north", List.of("north", "gate")));
        List<String> before = List.copyOf(watched.get("north"));
        assertTrue(before.size() > Shards.mine(cameras, "north", NAMES).size(), "north took some of south's");

        connected.remove("north");
        members.get("north").lost();
        members.get("north").drain();
        assertFalse(members.get("north").view().brokerConnected());
        // statuses cannot arrive without the broker; what arrives before the next settle changes nothing yet
        status("gate", false, "north");
        assertEquals(before, watched.get("north"), "kept while the broker is away");
        assertEquals(before, members.get("north").watching());

        // the broker is back: the retained statuses decide (gate offline, south back); gate was online when the
        // broker went, so it has the reconnect grace to show up before its cameras move
        alive.remove("gate");
        alive.add("south");
        members.get("north").status("south", true);
        subscribeAndSettle("north");
        assertEquals(Shards.mine(cameras, "north", List.of("north", "south", "gate")), watched.get("north"),
                "south's cameras back to south; gate's stay with gate for the grace");
        awaitWatched("north", Shards.mine(cameras, "north", List.of("north", "south")));
    }

    @Test
    void theWillsABrokerSendsAsItShutsDownMoveNothing() throws Exception {
        alive.addAll(List.of("south", "gate"));
        subscribeAndSettle("north", "south", "gate");
        List<String> own = Shards.mine(cameras, "north", NAMES);
        // a broker shutting down sends the others' wills, then closes this instance's connection
        Membership north = members.get("north");
        connected.remove("north");
        north.status("south", false);
        north.status("gate", false);
        north.lost();
        north.drain();
        TimeUnit.MILLISECONDS.sleep(Membership.OFFLINE_GRACE_MILLIS + 500); // longer than the grace
        north.drain();
        assertEquals(own, watched.get("north"), "nothing taken while the broker is away");
        // back: the wills are retained; south and gate reconnect within the reconnect grace
        north.status("south", false);
        north.status("gate", false);
        subscribeAndSettle("north"); // the refreshes come again: south and gate are back
        status("gate", true, "north");
        status("south", true, "north");
        TimeUnit.MILLISECONDS.sleep((long) (RECONNECT_GRACE * 1000) + 500); // past the grace: nothing moved
        north.drain();
        assertEquals(own, watched.get("north"));
        assertEquals(0, north.view().moves(), "no camera moved");
    }

    @Test
    void aBrokerAwayLongerThanTheSilenceMovesNothingWhenTheOthersReconnectLater() throws Exception {
        // a broker without persistence comes back with no retained status at all; north finds it first, the others
        // within the reconnect grace, but after north settled. Their last refresh is older than three keep-alives.
        alive.addAll(List.of("south", "gate"));
        subscribeAndSettle("north", "south", "gate");
        List<String> own = Shards.mine(cameras, "north", NAMES);
        Membership north = members.get("north");
        connected.remove("north");
        alive.clear();
        north.lost();
        north.drain();
        TimeUnit.MILLISECONDS.sleep(Membership.SILENT_KEEP_ALIVES * KEEP_ALIVE * 1000L + 500); // the outage
        subscribeAndSettle("north");
        TimeUnit.MILLISECONDS.sleep((long) (RECONNECT_GRACE * 1000) - 1000); // the others still finding the broker
        north.drain();
        assertEquals(own, watched.get("north"), "nothing taken while the others reconnect");
        alive.addAll(List.of("south", "gate"));
        TimeUnit.MILLISECONDS.sleep(2000); // their refreshes arrive
        north.drain();
        assertEquals(own, watched.get("north"));
        assertEquals(0, north.view().moves(), "no camera moved");
    }

    @Test
    void anInstanceThatWasStoppedDoesNotTakeTheOthersForSilent() throws Exception {
        // SIGSTOP of north for longer than three keep-alives: nothing reaches it meanwhile, and when it runs again
        // the others' last refresh is old only because north itself did not run
        alive.addAll(List.of("south", "gate"));
        subscribeAndSettle("north", "south", "gate");
        List<String> own = Shards.mine(cameras, "north", NAMES);
        Membership north = members.get("north");
        connected.remove("north");
        north.stall(Membership.SILENT_KEEP_ALIVES * KEEP_ALIVE * 1000L + 1000);
        north.drain();
        connected.add("north"); // running again: the refreshes reach it within a second
        TimeUnit.MILLISECONDS.sleep(1500);
        north.drain();
        assertEquals(own, watched.get("north"), "nothing taken on waking up");
        assertEquals(0, north.view().moves(), "no camera moved");
    }

    @Test
    void anInstanceWhoseStatusIsNotRefreshedIsTakenForOffline() throws Exception {
        // its will never comes (its broker node died with it): its retained online goes stale; gate refreshes
        alive.add("gate");
        long t0 = System.nanoTime();
        subscribeAndSettle("north", "south", "gate");
        awaitWatched("north", Shards.mine(cameras, "north", List.of("north", "gate")));
        double took = (System.nanoTime() - t0) / 1e9;
        assertTrue(took >= Membership.SILENT_KEEP_ALIVES * KEEP_ALIVE - 0.5, "not before it is silent: " + took);
    }

    @Test
    void atStartAnInstanceWatchesItsShareOfAllAndStatusesOfStrangersAreIgnored() throws Exception {
        Membership north = members.get("north");
        assertEquals(Shards.mine(cameras, "north", NAMES), north.watching());
        assertFalse(north.view().brokerConnected());
        // a retained status of an instance from another config, and none of gate (never started): gate is offline
        north.status("east", true);
        alive.add("south");
        subscribeAndSettle("north", "south");
        assertEquals(Shards.mine(cameras, "north", List.of("north", "south")), watched.get("north"));
        assertEquals(3, north.view().instances().size(), "only the configured instances");
        assertEquals(Boolean.FALSE, north.view().instances().get(2).online(), "gate, never seen, is offline");
    }
}
