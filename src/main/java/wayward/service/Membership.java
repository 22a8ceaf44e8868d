package wayward.service;

import java.time.Clock;
import java.time.Instant;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.Executors;
import java.util.concurrent.ScheduledExecutorService;
import java.util.concurrent.TimeUnit;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;
import wayward.delivery.PeerWatch;
import wayward.http.Instances;

/**
 * Which cameras this instance watches when instances share one config and see each other through the MQTT broker
 * they publish to: rendezvous hashing ({@link Shards}) over the configured instances that are online, this one
 * always counted. An instance is online while its retained status on the broker says so; the broker fires its
 * will (offline) when its connection drops, at once when its process dies and after 1.5 keep-alive periods when
 * its host or network does (MQTT 3.1.1 §3.1.2.5, §3.1.2.10). So when one dies the others take its cameras, and
 * when it comes back they hand them back; hashing moves no other camera.
 *
 * <p>Until the first statuses are read, and while the broker is unreachable, nobody can know who is alive: this
 * instance then keeps the cameras it watches and takes no others (at start, its share of all configured
 * instances). A broker outage so leaves no camera unwatched, at the price of two instances watching one camera
 * until the broker is back. Each move is logged and raised once as {@code camera_reassigned}, by the instance that
 * stays up: the one that takes a camera from an instance gone offline, or the one that hands it to an instance
 * come back.
 *
 * <p>The broker's callbacks come on its event loop; they are handed to one thread of this class, which decides,
 * tells the {@link Watcher} and the {@link Announcer}, and publishes a snapshot for the status server.
 */
public final class Membership implements PeerWatch, AutoCloseable {
    private static final Logger LOG = LoggerFactory.getLogger(Membership.class);
    /**
     * After a re-subscription, how long the retained statuses have to arrive before they are acted on; after the
     * first one, a keep-alive (at least this).
     */
    public static final long SETTLE_MILLIS = 1000;
    /**
     * Each instance refreshes its online status once a keep-alive; one not heard for this many keep-alives is taken
     * for offline even though its will never came (its broker node died with it, or a bridge lost it).
     */
    public static final int SILENT_KEEP_ALIVES = 3;
    /**
     * How long an instance read offline while this one is connected still counts as online: a broker that shuts
     * down sends the will of every client first, and this instance's own connection drops right after.
     */
    public static final long OFFLINE_GRACE_MILLIS = 2000;
    private static final long TICK_MILLIS = 500;
    /** A gap between ticks from which this instance counts as having been stopped, not the others as silent. */
    private static final long STALL_NANOS = TimeUnit.SECONDS.toNanos(2);

    /** Starts and stops cameras; called on the membership thread with the ids this instance now watches. */
    public interface Watcher {
        void watch(List<String> cameras);
    }

    /** Raises the move of a camera (the event); called on the membership thread. */
    public interface Announcer {
        void moved(String camera, String from, String to, String reason);
    }

    private final String self;
    private final List<String> instances;
    private final Watcher watcher;
    private final Announcer announcer;
    private final Clock clock;
    private final ScheduledExecutorService thread;
    private final long silentNanos;
    private final long reconnectGraceNanos;
    private final long firstSettleMillis;

    /** What this instance knows of another. Confined to the membership thread. */
    private static final class Peer {
        /** Its last status: true online, false offline; null: none read. */
        Boolean online;
        /** When this instance saw it change, wall clock; null: never. */
        Instant since;
        /** System.nanoTime() of its last online status. */
        long heard;
        /** System.nanoTime() of the offline status that took it down. */
        long downAt;
        /** How long after {@link #downAt} it still counts as online. */
        long graceNanos;

        boolean counts(long now) {
            return Boolean.TRUE.equals(online) || (Boolean.FALSE.equals(online) && now - downAt < graceNanos);
        }
    }

    // confined to the membership thread
    private List<String> cameras;
    private final Map<String, Peer> peers = new HashMap<>();
    /** Each camera's instance as last decided, config order. */
    private Map<String, String> owners;
    /** The instances {@link #owners} was hashed over: the same list again decides nothing new. */
    private List<String> decidedOver;
    private boolean subscribed;
    private boolean settled;
    private boolean everSettled;
    private long generation;
    private long moves;
    /** System.nanoTime() of the last tick; 0 before the first. */
    private long lastTick;
    /** System.nanoTime() of the last (re)connection to the broker. */
    private long connectedAt;

    private volatile Instances view;

    /**
     * @param self                  this instance's name, one of {@code instances}
     * @param instances             every configured instance
     * @param cameras               every configured camera's id, config order
     * @param keepAliveSeconds      the MQTT keep-alive, which is also how often every instance refreshes its status
     * @param reconnectGraceSeconds after the broker was lost and is back: how long an instance that was online
     *                              before and reads offline now still counts as online (the time it may take to
     *                              find the broker again: the longest reconnect backoff and a keep-alive)
     */
    public Membership(String self, List<String> instances, List<String> cameras, int keepAliveSeconds,
            double reconnectGraceSeconds, Watcher watcher, Announcer announcer, Clock clock) {
        this.self = self;
        this.instances = List.copyOf(instances);
        this.cameras = List.copyOf(cameras);
        this.watcher = watcher;
        this.announcer = announcer;
        this.clock = clock;
        for (String i : this.instances) {
            if (!i.equals(self)) {
                peers.put(i, new Peer());
            }
        }
        this.owners = owners(this.instances);
        this.decidedOver = this.instances;
        this.silentNanos = TimeUnit.SECONDS.toNanos((long) SILENT_KEEP_ALIVES * keepAliveSeconds);
        this.firstSettleMillis = Math.max(SETTLE_MILLIS, TimeUnit.SECONDS.toMillis(keepAliveSeconds));
        this.reconnectGraceNanos = (long) (reconnectGraceSeconds * 1e9);
        this.thread = Executors.newSingleThreadScheduledExecutor(r -> {
            Thread t = new Thread(r, "membership");
            t.setDaemon(true);
            return t;
        });
        thread.scheduleWithFixedDelay(this::tick, TICK_MILLIS, TICK_MILLIS, TimeUnit.MILLISECONDS);
        publishView();
    }

    /** The cameras this instance watches now (at start: its share of all configured instances). Any thread. */
    public List<String> watching() {
        List<String> mine = new ArrayList<>();
        for (Instances.Assignment a : view.cameras()) {
            if (a.instance().equals(self)) {
                mine.add(a.camera());
            }
        }
        return mine;
    }

    /** What the status server shows. Any thread. */
    public Instances view() {
        return view;
    }

    @Override
    public void subscribed() {
        thread.execute(() -> {
            subscribed = true;
            connectedAt = System.nanoTime();
            long g = ++generation;
            // the first time, a keep-alive: instances started together (a site's power coming back, a rollout)
            // find the broker within it, and none takes the others' cameras only to hand them back
            thread.schedule(() -> settle(g), everSettled ? SETTLE_MILLIS : firstSettleMillis, TimeUnit.MILLISECONDS);
        });
    }

    @Override
    public void status(String instance, boolean up) {
        thread.execute(() -> {
            Peer p = peers.get(instance);
            if (p == null) {
                LOG.debug("instance {} is {} on the broker but not another of {}; ignored", instance,
                        up ? "online" : "offline", instances);
                return;
            }
            long now = System.nanoTime();
            boolean counted = p.counts(now);
            if (up) {
                p.heard = now;
            }
            if (!Boolean.valueOf(up).equals(p.online)) {
                p.since = clock.instant();
                if (!up) {
                    p.downAt = now;
                    // a will read while connected waits a moment: a broker shutting down sends every client's will
                    // before it closes, and this instance's own connection then drops at once. After the broker
                    // was lost, one online before gets the time it needs to find the broker again.
                    p.graceNanos = !counted ? 0 : settled ? TimeUnit.MILLISECONDS.toNanos(OFFLINE_GRACE_MILLIS)
                            : everSettled ? reconnectGraceNanos : 0;
                }
                p.online = up;
                if (settled) {
                    LOG.info("instance {} is {} (its status on the broker){}", instance, up ? "online" : "offline",
                            up || p.graceNanos == 0 ? "" : "; its cameras move if it stays so for "
                                    + TimeUnit.NANOSECONDS.toMillis(p.graceNanos) / 1000.0 + " s");
                }
            }
            if (settled) {
                decide();
            }
            publishView();
        });
    }

    @Override
    public void lost() {
        thread.execute(() -> {
            subscribed = false;
            settled = false;
            generation++;
            // whoever counted as online when the broker went stays so until the broker tells otherwise
            long now = System.nanoTime();
            for (Peer p : peers.values()) {
                if (p.counts(now)) {
                    p.online = true;
                    p.heard = now;
                }
            }
            LOG.warn("membership: the broker is unreachable, so nobody can tell which instances are alive: this "
                    + "instance keeps the {} cameras it watches and takes no others until the broker is back",
                    watching().size());
            publishView();
        });
    }

    /**
     * The config's cameras changed (a reload): hashing covers the new list (no move is announced for it). Returns
     * the cameras this instance watches now, for the caller to start; waits for the membership thread.
     */
    public List<String> camerasChanged(List<String> next) {
        try {
            return thread.submit(() -> {
                changeCameras(next);
                return watching();
            }).get();
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            return watching();
        } catch (java.util.concurrent.ExecutionException e) {
            throw new IllegalStateException(e.getCause());
        }
    }

    private void changeCameras(List<String> next) {
        cameras = List.copyOf(next);
        Map<String, String> kept = new LinkedHashMap<>();
        Map<String, String> fresh = owners(online());
        for (String c : cameras) {
            kept.put(c, settled || !owners.containsKey(c) ? fresh.get(c) : owners.get(c));
        }
        owners = kept;
        // hashed afresh over those online when settled; otherwise the next decision hashes everything again
        decidedOver = settled ? online() : null;
        publishView();
    }

    /**
     * Once a second while settled: an instance online by its last status that has not refreshed it for a while is
     * taken for offline, and an offline one whose grace has run out loses its cameras.
     */
    private void tick() {
        long now = System.nanoTime();
        long gap = lastTick == 0 ? 0 : now - lastTick;
        lastTick = now;
        if (gap > STALL_NANOS) {
            // this instance itself did not run (SIGSTOP, a suspended VM, a long pause): the others' silence over
            // that time says nothing of them, so it does not count towards their being taken for offline
            for (Peer p : peers.values()) {
                p.heard += gap - TimeUnit.MILLISECONDS.toNanos(TICK_MILLIS);
            }
            LOG.warn("membership: this instance did not run for {} s (stopped or paused); the others' silence over "
                    + "that time is not held against them", TimeUnit.NANOSECONDS.toMillis(gap) / 1000.0);
        }
        if (!settled) {
            return;
        }
        for (Map.Entry<String, Peer> e : peers.entrySet()) {
            Peer p = e.getValue();
            // one not heard since this instance (re)connected may still be finding the broker after an outage
            // (a broker without persistence keeps no retained status): it gets the reconnect grace as well
            boolean sinceConnected = p.heard - connectedAt >= 0;
            long quiet = now - (sinceConnected ? p.heard : connectedAt);
            long allowed = sinceConnected ? silentNanos : Math.max(silentNanos, reconnectGraceNanos);
            if (Boolean.TRUE.equals(p.online) && quiet > allowed) {
                p.online = false;
                p.since = clock.instant();
                p.downAt = now;
                p.graceNanos = 0;
                LOG.warn("instance {} has not refreshed its status for {} s (every instance does once a keep-alive): "
                        + "taken for offline", e.getKey(), TimeUnit.NANOSECONDS.toSeconds(now - p.heard));
            }
        }
        decide();
    }

    private void settle(long g) {
        if (g != generation || !subscribed) {
            return;
        }
        settled = true;
        everSettled = true;
        List<String> up = online();
        LOG.info("membership: online by their status on the broker: {} of {}", up, instances);
        decide();
        publishView(); // settled, even when nobody came or went
    }

    /** The configured instances that count as online now, config order; this one always. */
    private List<String> online() {
        long now = System.nanoTime();
        List<String> up = new ArrayList<>();
        for (String i : instances) {
            if (i.equals(self) || peers.get(i).counts(now)) {
                up.add(i);
            }
        }
        return up;
    }

    private Map<String, String> owners(List<String> over) {
        Map<String, String> out = new LinkedHashMap<>();
        for (String c : cameras) {
            out.put(c, Shards.owner(c, over));
        }
        return out;
    }

    /** Hashes over the instances online now, logs and announces each move, and starts or stops cameras. */
    private void decide() {
        List<String> up = online();
        if (up.equals(decidedOver)) {
            return; // a refreshed status or a tick: nobody came or went
        }
        decidedOver = up;
        Map<String, String> next = owners(up);
        boolean mineChanged = false;
        for (Map.Entry<String, String> e : next.entrySet()) {
            String camera = e.getKey();
            String to = e.getValue();
            String from = owners.get(camera);
            if (from == null || from.equals(to)) {
                continue;
            }
            moves++;
            boolean fromGone = !up.contains(from);
            String reason = fromGone ? from + " went offline" : to + " came online";
            LOG.info("camera {}: moves from instance {} to {} ({})", camera, from, to, reason);
            mineChanged |= from.equals(self) || to.equals(self);
            // raised once, by the instance that stays up: the one taking over, or the one handing back
            if (fromGone ? to.equals(self) : from.equals(self)) {
                announcer.moved(camera, from, to, reason);
            }
        }
        owners = next;
        publishView();
        if (mineChanged) {
            try {
                watcher.watch(watching());
            } catch (RuntimeException ex) {
                LOG.error("membership: starting or stopping cameras failed: {}", ex.toString());
            }
        }
    }

    private void publishView() {
        List<String> up = online();
        List<Instances.Peer> shown = new ArrayList<>();
        for (String i : instances) {
            shown.add(new Instances.Peer(i, up.contains(i), i.equals(self) ? null : peers.get(i).since));
        }
        List<Instances.Assignment> as = new ArrayList<>();
        for (Map.Entry<String, String> e : owners.entrySet()) {
            String owner = e.getValue();
            String reason;
            if (!settled) {
                reason = everSettled ? "kept as it was: the broker is unreachable, so nobody can tell who is alive"
                        : "its share of all configured instances, until their statuses are read";
            } else {
                String home = Shards.owner(e.getKey(), instances);
                reason = home.equals(owner) ? "its share of the instances online"
                        : "its share of the instances online; " + home + ", whose share it is, is offline";
            }
            as.add(new Instances.Assignment(e.getKey(), owner, reason));
        }
        view = new Instances(self, "broker", settled, shown, as, moves);
    }

    /** Holds the membership thread for {@code millis}, as a stopped process would be (tests). */
    void stall(long millis) {
        thread.execute(() -> {
            try {
                TimeUnit.MILLISECONDS.sleep(millis);
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
            }
        });
    }

    /** Waits until everything handed to the membership thread so far is done (tests). */
    void drain() throws Exception {
        thread.submit(() -> { }).get();
    }

    @Override
    public void close() {
        thread.shutdownNow();
    }
}
