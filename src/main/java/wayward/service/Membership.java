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
    /** After the subscription, how long the retained statuses have to arrive before they are acted on. */
    public static final long SETTLE_MILLIS = 1000;

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

    // confined to the membership thread
    private List<String> cameras;
    /** The other instances' last status: true online, false offline; absent: none read yet. */
    private final Map<String, Boolean> online = new HashMap<>();
    private final Map<String, Instant> since = new HashMap<>();
    /** Each camera's instance as last decided, config order. */
    private Map<String, String> owners;
    private boolean subscribed;
    private boolean settled;
    private boolean everSettled;
    private long generation;
    private long moves;

    private volatile Instances view;

    /**
     * @param self      this instance's name, one of {@code instances}
     * @param instances every configured instance
     * @param cameras   every configured camera's id, config order
     */
    public Membership(String self, List<String> instances, List<String> cameras, Watcher watcher, Announcer announcer,
            Clock clock) {
        this.self = self;
        this.instances = List.copyOf(instances);
        this.cameras = List.copyOf(cameras);
        this.watcher = watcher;
        this.announcer = announcer;
        this.clock = clock;
        this.owners = owners(this.instances);
        this.thread = Executors.newSingleThreadScheduledExecutor(r -> {
            Thread t = new Thread(r, "membership");
            t.setDaemon(true);
            return t;
        });
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
            long g = ++generation;
            thread.schedule(() -> settle(g), SETTLE_MILLIS, TimeUnit.MILLISECONDS);
        });
    }

    @Override
    public void status(String instance, boolean up) {
        thread.execute(() -> {
            if (!instances.contains(instance)) {
                LOG.debug("instance {} is {} on the broker but not one of {}; ignored", instance,
                        up ? "online" : "offline", instances);
                return;
            }
            Boolean was = online.put(instance, up);
            if (was == null || was != up) {
                since.put(instance, clock.instant());
                if (settled) {
                    LOG.info("instance {} is {} (its status on the broker)", instance, up ? "online" : "offline");
                }
            }
            if (settled) {
                decide();
            }
        });
    }

    @Override
    public void lost() {
        thread.execute(() -> {
            subscribed = false;
            settled = false;
            generation++;
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
        publishView();
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
    }

    /** The configured instances online now, config order; this one always. */
    private List<String> online() {
        List<String> up = new ArrayList<>();
        for (String i : instances) {
            if (i.equals(self) || Boolean.TRUE.equals(online.get(i))) {
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
        List<Instances.Peer> peers = new ArrayList<>();
        for (String i : instances) {
            peers.add(new Instances.Peer(i, up.contains(i), since.get(i)));
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
        view = new Instances(self, "broker", settled, peers, as, moves);
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
