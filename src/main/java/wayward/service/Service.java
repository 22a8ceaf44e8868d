package wayward.service;

import java.io.IOException;
import java.io.PrintStream;
import java.time.Clock;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.TimeUnit;
import java.util.function.Consumer;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;
import wayward.analysis.CameraConfig;
import wayward.config.ConfigPrinter;
import wayward.config.SiteConfig;
import wayward.delivery.EventBus;
import wayward.delivery.EventLog;
import wayward.delivery.MqttConfig;
import wayward.delivery.MqttPublisher;
import wayward.delivery.Outbox;
import wayward.delivery.PrintSink;
import wayward.delivery.WebhookConfig;
import wayward.delivery.WebhookSender;
import wayward.flow.FlowEstimator;
import wayward.secret.Urls;
import wayward.analysis.CameraPipeline;
import wayward.analysis.CameraStatus;
import wayward.analysis.FrameListener;
import wayward.analysis.LearnedHeadings;
import wayward.analysis.ReadingListener;
import wayward.http.StatusSource;

/**
 * Wires cameras to sinks, starts them, and shuts down in order: stop capture → drain analysis → deliver what
 * is queued → close the sinks. One instance per run; {@link #start} then {@link #awaitEnd} or {@link #stop}.
 */
public final class Service implements StatusSource {
    private static final Logger LOG = LoggerFactory.getLogger(Service.class);
    /** Shown in the log at every start; the README says the same. */
    public static final String CAUTION = "wayward is an aid for people who watch a site, not a safety system: "
            + "never make it the only protection where a wrong-way vehicle or person can be hurt. Video of people "
            + "falls under privacy law (signage, retention limits, access to recordings): follow local law, "
            + "site rules and licensed practice.";
    private static final int QUEUE_CAPACITY = 10_000;
    private static final long SEGMENT_BYTES = 8L << 20;

    /** How the cameras are read. */
    public enum Mode {
        /** The service: live sources, files paced to real time; event log and webhooks. */
        RUN,
        /** Like RUN, files looped, events also printed on standard output. */
        DEMO,
        /** One recorded file as fast as possible, every frame analysed, events on standard output only. */
        REPLAY
    }

    private volatile SiteConfig config;
    private final Clock clock = Clock.systemUTC();
    private CameraPipeline.Evidence evidence;
    private ReadingListener readingListener;
    private FrameListener frameListener;
    private double measureFrom = Double.NaN;
    private final List<CameraConfig> cameras;
    private final Mode mode;
    private final PrintStream stdout;
    private final int maxLoops;
    private final EventBus bus = new EventBus();
    private final wayward.delivery.RecentEvents recent = new wayward.delivery.RecentEvents(200);
    private Outbox outbox;
    private final List<CameraPipeline> pipelines = new java.util.concurrent.CopyOnWriteArrayList<>();
    private final CountDownLatch ended = new CountDownLatch(1);
    private wayward.clip.EvidenceWriter evidenceWriter;
    private java.util.concurrent.ScheduledExecutorService retention;
    private volatile boolean stopped;
    /** Instances sharing the config through the broker: who watches what; null otherwise. */
    private Membership membership;
    /** The operators' mutes (not in replay): the cameras' zone gate, kept in the data folder. */
    private Mutes mutes;
    /** The MQTT publisher that passes mutes between instances; null when this instance watches alone. */
    private MqttPublisher sharer;
    /** What the broker told of mutes before the mutes were read: carried out once they are. Guarded by itself. */
    private final List<Consumer<Mutes>> sharedEarly = new ArrayList<>();
    /** The mutes that mirror records, once read. Guarded by {@link #sharedEarly}. */
    private Mutes mirroring;
    /** Set once {@link #start} has started every camera; the status server, bound before, reads it. */
    private volatile boolean started;

    /** Before {@link #start}: every camera measures the CPU time of its stages from that stream time on (bench). */
    public void measureStages(double fromSeconds) {
        this.measureFrom = fromSeconds;
    }

    /** Before {@link #start}: every analysed frame of every camera goes to {@code l} (annotated replay). */
    public void listenFrames(FrameListener l) {
        this.frameListener = l;
    }

    /** Before {@link #start}: every zone reading of every camera goes to {@code l} (replay reports). */
    public void listenReadings(ReadingListener l) {
        this.readingListener = l;
    }
    /** Retention sweep of the evidence folder (the retention thread). */
    private void sweep() {
        try {
            wayward.clip.Retention.sweep(evidenceDir(),
                    java.time.Duration.ofMinutes((long) (config.clips().keepDays() * 24 * 60)),
                    (long) (config.clips().keepGigabytes() * 1e9), java.time.Instant.now());
        } catch (IOException | RuntimeException e) {
            LOG.error("retention sweep failed: {}", e.toString());
        }
    }

    /**
     * @param cameras  the cameras to watch (for replay: one camera whose source is the input file)
     * @param stdout   where DEMO and REPLAY print events
     * @param maxLoops DEMO: passes over the looped files before ending (0 = until stopped)
     */
    public Service(SiteConfig config, List<CameraConfig> cameras, Mode mode, PrintStream stdout, int maxLoops) {
        this.config = config;
        this.cameras = mode == Mode.REPLAY ? List.copyOf(cameras) : Shards.camerasOf(config, cameras);
        this.mode = mode;
        this.stdout = stdout;
        this.maxLoops = maxLoops;
    }

    public void start() throws IOException {
        List<wayward.event.Event> leftOpen = List.of();
        LOG.info(FlowEstimator.instructions());
        if (mode != Mode.REPLAY) {
            LOG.warn(CAUTION);
            if (config.shard() != null) {
                List<String> ids = new ArrayList<>();
                cameras.forEach(c -> ids.add(c.id()));
                LOG.info("instance {} of {}: watching {} of {} cameras: {}", config.shard().instance(),
                        config.shard().instances(), cameras.size(), config.cameras().size(), ids);
                if (config.shard().viaBroker()) {
                    List<String> all = new ArrayList<>();
                    config.cameras().forEach(c -> all.add(c.id()));
                    membership = new Membership(config.shard().instance(), config.shard().instances(), all,
                            config.mqtt().keepAliveSeconds(),
                            config.mqtt().maxBackoffSeconds() + config.mqtt().keepAliveSeconds(), this::watchOnly,
                            this::announceMove, clock);
                    LOG.info("membership: the instances online by their status on the broker share the cameras; "
                            + "when one goes offline the others take its cameras, and hand them back when it "
                            + "returns");
                } else {
                    LOG.info("membership: fixed: the cameras stay with their instance whatever its state");
                }
            }
            leftOpen = EventLog.leftOpen(config.dataDir().resolve("events.jsonl"));
            // a data folder of an older version keeps its evidence in clips/: move it before retention looks
            wayward.clip.EvidenceFolder.upgrade(config.dataDir());
            EventLog log = new EventLog(config.dataDir());
            bus.add(log, QUEUE_CAPACITY);
            LOG.info("events are written to {}", log.file());
            if (!config.webhooks().isEmpty() || config.mqtt() != null) {
                outbox = Outbox.open(config.dataDir().resolve("outbox"), config.outboxMaxBytes(), SEGMENT_BYTES);
                long runStart = outbox.nextSeq();
                bus.useOutbox(outbox);
                LOG.info("events for webhooks and MQTT go through the outbox in {} (at most {} MB, delivered at "
                        + "least once)", outbox.folder(), config.outboxMaxBytes() >> 20);
                for (WebhookConfig w : config.webhooks()) {
                    bus.add(new WebhookSender(w), 1000, (long) (w.maxBackoffSeconds() * 1000));
                    LOG.info("events are posted to {}", Urls.mask(w.url()));
                }
                if (config.mqtt() != null) {
                    MqttConfig m = config.mqtt();
                    List<String> zones = new ArrayList<>();
                    for (CameraConfig c : cameras) {
                        for (wayward.analysis.ZoneConfig z : c.zones()) {
                            zones.add(c.id() + "/" + z.id());
                        }
                    }
                    // instances sharing the cameras pass on the mutes asked of their status servers
                    boolean share = membership != null || config.shard() != null;
                    MqttPublisher publisher = new MqttPublisher(m, zones, runStart, membership,
                            m.commands() ? this::command : null, share ? sharedMutes() : null);
                    sharer = share ? publisher : null;
                    bus.add(publisher, 1000, (long) (m.maxBackoffSeconds() * 1000));
                    if (m.commands()) {
                        LOG.warn("MQTT commands are on: whoever may publish below {}/{}/<user>/ can mute cameras; "
                                + "the broker's ACL must let each operator write only below its own name (README, "
                                + "\"MQTT commands\")", m.topicPrefix(), wayward.delivery.MqttTopics.COMMAND_LEVEL);
                    }
                    LOG.info("events are published to {} under {}/", Urls.mask(m.url()), m.topicPrefix());
                }
            }
        }
        if (mode != Mode.RUN) {
            bus.add(new PrintSink(stdout), QUEUE_CAPACITY);
        }
        bus.add(recent, QUEUE_CAPACITY);
        if (mode != Mode.REPLAY) {
            mutes = new Mutes(config.dataDir(), config.cameras(), config.maxMute(), clock, bus::publish);
            if (membership != null) {
                mutes.raiseOnlyFor(c -> membership.watching().contains(c));
            } else if (config.shard() != null) {
                List<String> mine = new ArrayList<>();
                cameras.forEach(c -> mine.add(c.id()));
                mutes.raiseOnlyFor(mine::contains);
            }
            if (sharer != null) {
                mutes.shareWith(sharer::shareMute);
                synchronized (sharedEarly) {
                    mirroring = mutes;
                    sharedEarly.forEach(this::toMutes);
                    sharedEarly.clear();
                }
            }
        }
        for (wayward.event.Event e : leftOpen) {
            if (e.kind() == wayward.event.EventKind.ZONE_MUTED || e.kind() == wayward.event.EventKind.CAMERA_MUTED) {
                continue; // a mute outlives a restart (data_dir/mutes.json); it ends by itself or early
            }
            LOG.warn("camera {} zone {}: {} event {} was still open when the service stopped; it ends now",
                    e.camera(), e.zone(), e.kind().jsonName(), e.id());
            bus.publish(e.closedAtRestart(clock.instant()));
        }
        CameraPipeline.Evidence evidence = null;
        if (mode != Mode.REPLAY && config.clips().enabled()) {
            evidenceWriter = new wayward.clip.EvidenceWriter();
            evidence = new CameraPipeline.Evidence(config.dataDir(), config.clips(), evidenceWriter);
            LOG.info("evidence clips and snapshots go to {} (kept {} days, at most {} GB)",
                    evidenceDir(), config.clips().keepDays(), config.clips().keepGigabytes());
            retention = java.util.concurrent.Executors.newSingleThreadScheduledExecutor(r -> {
                Thread t = new Thread(r, "retention");
                t.setDaemon(true);
                return t;
            });
            retention.scheduleWithFixedDelay(this::sweep, 0, 10, java.util.concurrent.TimeUnit.MINUTES);
        }
        this.evidence = evidence;
        for (CameraConfig c : cameras) {
            pipelines.add(pipeline(c, config.flow()));
        }
        for (CameraPipeline p : pipelines) {
            LOG.info("camera {}: starting on {}", p.id(), Urls.mask(p.config().source()));
            p.start();
        }
        Thread watcher = new Thread(this::watch, "service-watch");
        watcher.setDaemon(true);
        watcher.start();
        started = true;
    }

    private CameraPipeline pipeline(CameraConfig c, wayward.flow.FlowConfig flow) {
        CameraPipeline p = new CameraPipeline(c, flow, bus::publish, clock, mode == Mode.REPLAY, mode != Mode.REPLAY,
                maxLoops, evidence, mutes != null ? mutes : wayward.analysis.ZoneGate.OPEN);
        if (mode != Mode.REPLAY) {
            p.learnInto(LearnedHeadings.folder(config.dataDir(), c.id()));
        }
        if (readingListener != null) {
            p.listenReadings(readingListener);
        }
        if (frameListener != null) {
            p.listenFrames(frameListener);
        }
        if (!Double.isNaN(measureFrom)) {
            p.measureStages(measureFrom);
        }
        return p;
    }


    /** Ends the wait when every camera has ended by itself (files without loop). */
    private void watch() {
        try {
            int ticks = 0;
            while (true) {
                Thread.sleep(500);
                synchronized (this) {
                    if (stopped) {
                        return;
                    }
                    if (pipelines.stream().noneMatch(CameraPipeline::running)) {
                        ended.countDown();
                        return;
                    }
                }
                if (++ticks % 60 == 0 && mode != Mode.REPLAY) {
                    for (CameraPipeline p : pipelines) {
                        p.checkLoad(30);
                    }
                }
            }
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        }
    }

    /** The settings outside [flow] and the cameras, as text, for telling whether they changed. */
    private static String rest(SiteConfig c) {
        return ConfigPrinter.toToml(new SiteConfig(c.file(), c.dataDir(), wayward.flow.FlowConfig.DEFAULTS,
                List.of(), c.webhooks(), c.clips(), c.mqtt(), c.outboxMaxBytes(), c.http(), c.shard(), null,
                c.maxMute()));
    }

    /**
     * Applies a new, already checked config to the running service: cameras that were removed stop, new ones
     * start, changed ones restart, unchanged ones keep running untouched. A change of [flow] restarts every
     * camera. Changes elsewhere ([service], [clips], [[webhook]], [mqtt], [outbox]) wait for the next restart,
     * and the log says so. Any thread; one reload at a time.
     */
    public void reload(SiteConfig next) {
        // outside the lock: the membership thread may be waiting for it to start or stop cameras
        List<String> mine = null;
        if (membership != null) {
            List<String> ids = new ArrayList<>();
            next.cameras().forEach(c -> ids.add(c.id()));
            mine = membership.camerasChanged(ids);
        }
        reload(next, mine);
    }

    private synchronized void reload(SiteConfig next, List<String> mine) {
        if (stopped) {
            return;
        }
        boolean flowChanged = !next.flow().equals(config.flow());
        if (flowChanged) {
            LOG.info("reload: [flow] changed; every camera restarts");
        }
        List<CameraConfig> nextCameras = mode == Mode.REPLAY ? next.cameras()
                : mine != null ? only(next.cameras(), mine) : Shards.camerasOf(next, next.cameras());
        applyCameras(nextCameras, next.flow(), flowChanged, "reload");
        if (!rest(next).equals(rest(config))) {
            LOG.warn("reload: changes to [service], [clips], [[webhook]], [mqtt] or [outbox] take effect at the "
                    + "next restart; the running values stay");
            next = new SiteConfig(next.file(), config.dataDir(), next.flow(), next.cameras(), config.webhooks(),
                    config.clips(), config.mqtt(), config.outboxMaxBytes(), config.http(), config.shard(),
                    next.timeZone(), config.maxMute());
        }
        config = next;
        if (mutes != null) {
            mutes.configChanged(next.cameras());
        }
        LOG.info("reload: done; {} cameras", pipelines.size());
    }

    private static List<CameraConfig> only(List<CameraConfig> all, List<String> ids) {
        List<CameraConfig> out = new ArrayList<>();
        for (CameraConfig c : all) {
            if (ids.contains(c.id())) {
                out.add(c);
            }
        }
        return out;
    }

    /** Membership: this instance now watches {@code ids} of the config's cameras (the membership thread). */
    private synchronized void watchOnly(List<String> ids) {
        if (stopped) {
            return;
        }
        applyCameras(only(config.cameras(), ids), config.flow(), false, "membership");
        LOG.info("membership: this instance watches {} of {} cameras: {}", pipelines.size(), config.cameras().size(),
                ids);
    }

    /**
     * An operator's MQTT command ({@code mute} or {@code unmute}). It comes on the MQTT event loop, which must not
     * wait for the mutes file's fsync: carried out on the mutes' thread.
     */
    private void command(String user, String verb, byte[] payload) {
        Mutes m = mutes;
        if (m == null) {
            LOG.warn("MQTT command from {}: {} before the mutes were read at the start; ignored",
                    wayward.secret.LogText.clean(user), wayward.secret.LogText.clean(verb));
            return;
        }
        m.later(() -> carryOut(m, user, verb, payload));
    }

    /** The mutes' side of the broker's mute records: each carried out on the mutes' thread, in their order. */
    private MqttPublisher.MuteRecords sharedMutes() {
        return new MqttPublisher.MuteRecords() {
            @Override
            public void subscribing() {
                toMutes(Mutes::subscribing);
            }

            @Override
            public void record(byte[] json) {
                toMutes(m -> m.mirror(json));
            }

            @Override
            public void caughtUp() {
                toMutes(Mutes::caughtUp);
            }
        };
    }

    /**
     * What the broker told of mutes (the MQTT event loop): carried out on the mutes' thread; what comes before the
     * mutes were read at the start waits for them.
     */
    private void toMutes(Consumer<Mutes> action) {
        Mutes m;
        synchronized (sharedEarly) {
            m = mirroring;
            if (m == null) {
                sharedEarly.add(action);
                return;
            }
        }
        m.later(() -> action.accept(m));
    }

    private void carryOut(Mutes m, String user, String verb, byte[] payload) {
        if (!verb.equals("mute") && !verb.equals("unmute")) {
            LOG.warn("MQTT command from {}: unknown verb {} (expected mute or unmute); ignored",
                    wayward.secret.LogText.clean(user), wayward.secret.LogText.clean(verb));
            return;
        }
        try {
            // every instance reads the command itself: nothing to pass on
            wayward.http.MuteState s = wayward.http.MuteRequests.apply(m.unshared(), verb.equals("mute"),
                    new String(payload, java.nio.charset.StandardCharsets.UTF_8), user, clock);
            LOG.info("MQTT command from {}: {} of camera {}{} done", wayward.secret.LogText.clean(user), verb,
                    s.camera(), s.zone() == null ? "" : " zone " + s.zone());
        } catch (IllegalArgumentException | wayward.http.MuteControl.Refused e) {
            LOG.warn("MQTT command from {}: {} refused: {}", wayward.secret.LogText.clean(user), verb,
                    wayward.secret.LogText.clean(e.getMessage()));
        }
    }

    /** Membership: raises {@code camera_reassigned}, a start and its end at once (the membership thread). */
    private void announceMove(String camera, String from, String to, String reason) {
        String id = java.util.UUID.randomUUID().toString();
        java.time.Instant now = clock.instant();
        wayward.event.Event.Handover h = new wayward.event.Event.Handover(from, to, reason);
        bus.publish(wayward.event.Event.handover(id, camera, wayward.event.Event.Phase.START, now, h));
        bus.publish(wayward.event.Event.handover(id, camera, wayward.event.Event.Phase.END, now, h));
    }

    /**
     * Stops the running cameras not in {@code nextCameras} or changed, starts the new and changed ones, keeps the
     * rest running untouched. Holding the lock.
     */
    private void applyCameras(List<CameraConfig> nextCameras, wayward.flow.FlowConfig flow, boolean flowChanged,
            String why) {
        java.util.Map<String, CameraConfig> wanted = new java.util.LinkedHashMap<>();
        for (CameraConfig c : nextCameras) {
            wanted.put(c.id(), c);
        }
        List<CameraPipeline> keep = new ArrayList<>();
        List<CameraPipeline> stopping = new ArrayList<>();
        for (CameraPipeline p : pipelines) {
            CameraConfig n = wanted.get(p.id());
            if (n == null) {
                LOG.info("{}: camera {} {}; stopping it", why, p.id(), why.equals("reload") ? "removed"
                        : "moves to another instance");
                stopping.add(p);
            } else if (flowChanged || !ConfigPrinter.cameraIdentity(n).equals(ConfigPrinter.cameraIdentity(p.config()))) {
                if (!flowChanged) {
                    LOG.info("{}: camera {} changed; restarting it", why, p.id());
                }
                stopping.add(p);
            } else {
                if (why.equals("reload")) {
                    LOG.info("reload: camera {} unchanged; it keeps running", p.id());
                }
                keep.add(p);
            }
        }
        for (CameraPipeline p : stopping) {
            p.stop();
        }
        for (CameraPipeline p : stopping) {
            try {
                if (!p.join(5000)) {
                    LOG.warn("camera {}: did not stop within 5 s", p.id());
                }
                p.awaitClips(10_000);
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
                return;
            }
        }
        List<CameraPipeline> now = new ArrayList<>();
        for (CameraConfig c : nextCameras) {
            CameraPipeline kept = keep.stream().filter(p -> p.id().equals(c.id())).findFirst().orElse(null);
            if (kept != null) {
                now.add(kept);
                continue;
            }
            CameraPipeline p = pipeline(c, flow);
            if (pipelines.stream().noneMatch(old -> old.id().equals(c.id()))) {
                LOG.info("{}: camera {} {}; starting on {}", why, c.id(), why.equals("reload") ? "added"
                        : "moves to this instance", Urls.mask(c.source()));
            }
            p.start();
            now.add(p);
        }
        pipelines.clear();
        pipelines.addAll(now);
    }

    /** Blocks until every camera has ended by itself, or {@link #stop} was called. */
    public void awaitEnd() throws InterruptedException {
        ended.await();
    }

    public boolean awaitEnd(long timeout, TimeUnit unit) throws InterruptedException {
        return ended.await(timeout, unit);
    }

    public List<CameraPipeline> pipelines() {
        return List.copyOf(pipelines);
    }

    /** The cameras as the status server and reports read them (read-only). */
    @Override
    public List<CameraStatus> cameraStatus() {
        return List.copyOf(pipelines);
    }

    public SiteConfig config() {
        return config;
    }

    @Override
    public EventBus bus() {
        return bus;
    }

    /** The outbox, or null when no webhook or broker is configured (or in replay). */
    @Override
    public Outbox outbox() {
        return outbox;
    }

    @Override
    public wayward.delivery.RecentEvents recentEvents() {
        return recent;
    }

    @Override
    public wayward.http.MuteControl muteControl() {
        return mutes;
    }

    @Override
    public wayward.http.Instances instances() {
        if (membership != null) {
            return membership.view();
        }
        wayward.config.ShardConfig shard = config.shard();
        if (shard == null || mode == Mode.REPLAY) {
            return null;
        }
        List<wayward.http.Instances.Peer> peers = new ArrayList<>();
        for (String i : shard.instances()) {
            peers.add(new wayward.http.Instances.Peer(i, i.equals(shard.instance()) ? Boolean.TRUE : null, null));
        }
        List<wayward.http.Instances.Assignment> as = new ArrayList<>();
        for (CameraConfig c : config.cameras()) {
            as.add(new wayward.http.Instances.Assignment(c.id(), Shards.owner(c.id(), shard.instances()),
                    "its share of all configured instances (membership fixed)"));
        }
        return new wayward.http.Instances(shard.instance(), shard.membership(), false, peers, as, 0);
    }

    @Override
    public boolean starting() {
        return !started;
    }

    @Override
    public java.nio.file.Path evidenceDir() {
        return wayward.clip.EvidenceFolder.of(config().dataDir());
    }

    /** Orderly shutdown, each step time-limited. Idempotent; any thread. */
    public synchronized void stop() {
        if (stopped) {
            return;
        }
        stopped = true;
        if (membership != null) {
            membership.close();
        }
        if (mutes != null) {
            mutes.close();
        }
        for (CameraPipeline p : pipelines) {
            p.stop();
        }
        for (CameraPipeline p : pipelines) {
            try {
                if (!p.join(5000)) {
                    LOG.warn("camera {}: did not stop within 5 s", p.id());
                }
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
            }
        }
        // clips: the capture threads have ended them; wait for the trailers, then the snapshots and sidecars
        for (CameraPipeline p : pipelines) {
            try {
                p.awaitClips(10_000);
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
            }
        }
        if (evidenceWriter != null) {
            evidenceWriter.close(5000);
        }
        if (retention != null) {
            retention.shutdownNow();
        }
        bus.close(10_000);
        ended.countDown();
        LOG.info("stopped");
    }
}
