package wayward.analysis;

import java.time.Clock;
import java.util.ArrayList;
import java.util.List;
import java.util.function.Consumer;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;
import org.slf4j.MDC;
import wayward.capture.FrameSlot;
import wayward.capture.MainStreamReader;
import wayward.capture.StreamLink;
import wayward.capture.SourceOptions;
import wayward.capture.VideoSource;
import wayward.flow.FlowConfig;
import wayward.event.Event;
import wayward.flow.FlowEstimator;
import wayward.flow.FlowField;
import wayward.image.GrayFrame;
import wayward.zone.ZoneReading;

/**
 * One camera's path: a capture thread ({@code capture-<id>}) reading and shrinking frames into a
 * {@link FrameSlot}, and an analysis thread ({@code analysis-<id>}) running flow, zone meters and rules and
 * handing events to a consumer. Flow and zone buffers are sized on the first frame and reused.
 */
public final class CameraPipeline implements CameraStatus {
    private static final Logger LOG = LoggerFactory.getLogger(CameraPipeline.class);
    /** A pause between analysed frames longer than this restarts the flow (no motion across a gap). */
    private static final double MAX_GAP_SECONDS = 2.0;

    private final CameraConfig camera;
    private final FlowConfig flowConfig;
    private final Consumer<Event> events;
    private final FrameSlot slot;
    private final VideoSource source;
    /** A two-stream camera's main stream ({@code source}), only demuxed; null for one stream. */
    private final MainStreamReader mainReader;
    private final Thread mainThread;
    private final Thread captureThread;
    private final Thread analysisThread;
    private final EvidenceKeeper evidence;
    private final wayward.rule.TamperWatch tamper;
    /** Per zone, in the config's order: meter, rule or learner. */
    private final List<ZoneChannel> channels = new ArrayList<>();
    private final ZoneFigures zoneFigures;
    private final LiveView live = new LiveView();
    private final StageMeter stages = new StageMeter();
    private final LoadCheck load;
    private volatile long analysedFrames;
    private volatile long analysisNanos;
    private volatile double lastStreamSeconds;
    private volatile java.nio.file.Path learnedDir;
    private volatile ReadingListener readings;
    private volatile FrameListener frames;
    /** The tamper conditions open now, kinds' JSON names (written by the analysis thread, a new list each change). */
    private volatile List<String> conditions = List.of();
    /** The open tamper conditions and their events' ids (analysis thread only). */
    private final java.util.EnumMap<wayward.event.EventKind, String> open =
            new java.util.EnumMap<>(wayward.event.EventKind.class);

    // analysis-thread state
    private FlowEstimator flow;
    /** Skips the flow of frames in which nothing changed around the zones; null when the config turns it off. */
    private StillGate gate;
    /** Analysed frames whose flow the gate skipped, over every resolution the stream had (a counter). */
    private volatile long stillFrames;
    private FlowField field;
    private final ZoneReading reading = new ZoneReading();

    /** Evidence settings of a pipeline: where clips go and who writes snapshots; null for none. */
    public record Evidence(java.nio.file.Path dataDir, wayward.clip.ClipConfig clips,
            wayward.clip.EvidenceWriter writer) {
    }

    /**
     * @param lossless analyse every frame up to the rate cap (replay); otherwise newest-wins (live)
     * @param realtime pace file sources to their timestamps
     * @param maxLoops for looping files, passes before the camera ends (0 = forever)
     */
    public CameraPipeline(CameraConfig camera, FlowConfig flowConfig, Consumer<Event> events, Clock clock,
            boolean lossless, boolean realtime, int maxLoops) {
        this(camera, flowConfig, events, clock, lossless, realtime, maxLoops, null);
    }

    /** @param evidence where clips, snapshots and sidecars go; null for none (replay) */
    public CameraPipeline(CameraConfig camera, FlowConfig flowConfig, Consumer<Event> events, Clock clock,
            boolean lossless, boolean realtime, int maxLoops, Evidence evidence) {
        this(camera, flowConfig, events, clock, lossless, realtime, maxLoops, evidence, ZoneGate.OPEN);
    }

    /** @param gate whether each zone may raise events now (mutes, hours) */
    public CameraPipeline(CameraConfig camera, FlowConfig flowConfig, Consumer<Event> events, Clock clock,
            boolean lossless, boolean realtime, int maxLoops, Evidence evidence, ZoneGate gate) {
        this.camera = camera;
        this.flowConfig = flowConfig;
        this.events = events;
        this.slot = new FrameSlot(lossless);
        this.evidence = new EvidenceKeeper(camera, evidence);
        // with two streams the analysis decodes only analysis_source, and source is only demuxed for clips
        this.source = new VideoSource(camera.id(), new SourceOptions(camera.analysedSource(), camera.loop(), realtime,
                camera.analysisWidth(), camera.analysisFps(), maxLoops, camera.input()), slot,
                new HealthEvents(camera.id(), camera.twoStreams() ? Event.ANALYSIS_SOURCE : null, events, clock),
                this.evidence.recorder());
        // the main stream is read only for clips (and, in bench, to measure its demux): with [clips] off it is
        // not opened at all
        if (camera.twoStreams() && (this.evidence.mainRecorder() != null || lossless)) {
            StreamLink link = new StreamLink();
            source.linkTo(link);
            this.mainReader = new MainStreamReader(camera.id(), new SourceOptions(camera.source(), camera.loop(),
                    realtime, camera.analysisWidth(), camera.analysisFps(), maxLoops, camera.input()),
                    new HealthEvents(camera.id(), Event.SOURCE, events, clock), this.evidence.mainRecorder(), link);
            this.evidence.mainUp(mainReader::watching);
            this.mainThread = new Thread(() -> {
                MDC.put("camera", camera.id());
                mainReader.run();
            }, "demux-" + camera.id());
        } else {
            this.mainReader = null;
            this.mainThread = null;
        }
        this.captureThread = new Thread(() -> {
            MDC.put("camera", camera.id());
            source.run();
        }, "capture-" + camera.id());
        this.analysisThread = new Thread(() -> {
            MDC.put("camera", camera.id());
            analyse();
        }, "analysis-" + camera.id());
        for (ZoneConfig z : camera.zones()) {
            channels.add(new ZoneChannel(camera, z, clock, gate));
        }
        this.tamper = camera.tamperAlerts() ? new wayward.rule.TamperWatch(camera.id(), clock) : null;
        this.zoneFigures = new ZoneFigures(camera.zones().size());
        this.load = new LoadCheck(camera.id(), camera.analysisFps());
    }

    @Override
    public String id() {
        return camera.id();
    }

    /**
     * Before {@link #start}: measure each stage's CPU time from stream time {@code fromSeconds} on (bench), each
     * thread starting its own count when its frames reach that time.
     */
    public void measureStages(double fromSeconds) {
        stages.startAt(fromSeconds);
        source.meter().startAt(fromSeconds);
        if (mainReader != null) {
            mainReader.measureFrom(fromSeconds);
        }
    }

    /** What was measured since counting began (all 0 before). */
    public StageFigures stageFigures() {
        StageFigures f = stages.figures(source.meter(), analysedFrames, lastStreamSeconds);
        return mainReader == null ? f : f.withMainDemux((double) mainReader.demuxCpuNanos(), mainReader.packetsMeasured(),
                mainReader.secondsMeasured());
    }

    /** Before {@link #start}: every analysed frame also goes to {@code l}. */
    public void listenFrames(FrameListener l) {
        this.frames = l;
    }

    /** Before {@link #start}: every zone reading also goes to {@code l}. */
    public void listenReadings(ReadingListener l) {
        this.readings = l;
    }

    public void start() {
        load.started(System.nanoTime());
        analysisThread.start();
        captureThread.start();
        if (mainThread != null) {
            mainThread.start();
        }
    }

    /** Stops capture (both streams); analysis finishes what is in the slot and closes open events. */
    public void stop() {
        source.stop();
        if (mainReader != null) {
            mainReader.stop();
        }
    }

    /** Waits for both threads; true when they ended within the time. */
    public boolean join(long timeoutMillis) throws InterruptedException {
        long deadline = System.currentTimeMillis() + timeoutMillis;
        captureThread.join(Math.max(1, deadline - System.currentTimeMillis()));
        analysisThread.join(Math.max(1, deadline - System.currentTimeMillis()));
        if (mainThread != null) {
            mainThread.join(Math.max(1, deadline - System.currentTimeMillis()));
        }
        return !captureThread.isAlive() && !analysisThread.isAlive() && (mainThread == null || !mainThread.isAlive());
    }

    public boolean running() {
        return captureThread.isAlive() || analysisThread.isAlive() || (mainThread != null && mainThread.isAlive());
    }

    /** For a file source that gave no frame at all: why; otherwise null. */
    public String sourceFailure() {
        return source.fileFailure();
    }

    @Override
    public long analysedFrames() {
        return analysedFrames;
    }

    @Override
    public long stillFrames() {
        return stillFrames;
    }

    /** Every 30 s (service watcher): the analysis rate actually reached; logs when analysis falls behind. */
    public void checkLoad(double seconds) {
        load.check(seconds, analysedFrames, droppedFrames());
    }

    /** Frames analysed per second over the last load check (before the first: since the start; never NaN). */
    @Override
    public double analysisFps() {
        return load.fps(analysedFrames, System.nanoTime());
    }

    /** Pictures decoded by the capture thread. */
    @Override
    public long framesIn() {
        return source.framesIn();
    }

    @Override
    public long decodeErrors() {
        return source.decodeErrors();
    }

    @Override
    public long reconnects() {
        return source.reconnects();
    }

    /** True while the (analysis) source delivers pictures (false before the first and during an outage). */
    @Override
    public boolean watching() {
        return source.watching();
    }

    @Override
    public int width() {
        return source.width();
    }

    @Override
    public int height() {
        return source.height();
    }

    /** The main stream of a two-stream camera, or null. */
    @Override
    public StreamState mainStream() {
        MainStreamReader m = mainReader;
        return m == null ? null : new StreamState("source", camera.source(), false, m.width(), m.height(),
                m.framesDecoded(), m.packetsIn(), m.reconnects(), m.watching());
    }

    /** A two-stream camera's main stream's time on the analysis axis minus its own, seconds; NaN otherwise. */
    @Override
    public double mainShiftSeconds() {
        return mainReader == null ? Double.NaN : mainReader.shiftSeconds();
    }

    /** Wall time spent in flow, zone meters and rules so far, seconds. */
    @Override
    public double analysisSeconds() {
        return analysisNanos / 1e9;
    }

    @Override
    public CameraConfig config() {
        return camera;
    }

    /**
     * Where learned headings are kept (data_dir/learned/&lt;camera&gt;); a heading found there is used at once.
     * Before {@link #start}; without it (replay) learning stays in memory.
     */
    public void learnInto(java.nio.file.Path dir) {
        this.learnedDir = dir;
        for (ZoneChannel c : channels) {
            if (!c.learning()) {
                continue;
            }
            java.nio.file.Path f = LearnedHeadings.file(dir, c.zone().id());
            try {
                double h = LearnedHeadings.read(f);
                if (!Double.isNaN(h)) {
                    c.useLearned(h, field);
                    LOG.info("camera {} zone {}: heading {}° learned earlier ({})", camera.id(), c.zone().id(),
                            String.format(java.util.Locale.ROOT, "%.1f", h), f);
                }
            } catch (java.io.IOException e) {
                LOG.warn("camera {} zone {}: cannot read the learned heading ({}); learning again", camera.id(),
                        c.zone().id(), e.getMessage());
            }
        }
    }

    /** The zone's heading in use: configured, learned, or NaN (motion zone, or still learning). */
    @Override
    public double zoneHeading(int zone) {
        return channels.get(zone).heading();
    }

    /** True while the zone is still learning its heading. */
    @Override
    public boolean zoneLearning(int zone) {
        return channels.get(zone).learning();
    }

    /** The latest frame and flow for the live view. */
    @Override
    public LiveView live() {
        return live;
    }

    /** The zone's latest coverage (share of its pixels moving), 0..1; NaN before the first reading. */
    @Override
    public double zoneMovingShare(int zone) {
        return zoneFigures.movingShare(zone);
    }

    /** The zone's latest share of pixels moving against its heading, 0..1; NaN before the first reading. */
    @Override
    public double zoneAgainstShare(int zone) {
        return zoneFigures.againstShare(zone);
    }

    /** Events started in the zone so far. */
    @Override
    public long zoneEvents(int zone) {
        return zoneFigures.events(zone);
    }

    @Override
    public long droppedFrames() {
        return slot.dropped();
    }

    @Override
    public double streamSeconds() {
        return lastStreamSeconds;
    }

    private void analyse() {
        double previous = Double.NaN;
        try {
            while (true) {
                GrayFrame f = slot.take(250);
                if (f == null) {
                    if (slot.drained()) {
                        break;
                    }
                    continue;
                }
                if (field == null || field.imageWidth != f.width || field.imageHeight != f.height) {
                    setUp(f.width, f.height);
                    previous = Double.NaN;
                }
                double t = f.streamSeconds;
                double dt = t - previous;
                if (!Double.isNaN(previous) && (dt <= 0 || dt > MAX_GAP_SECONDS)) {
                    flow.reset();
                    if (gate != null) {
                        gate.reset();
                    }
                    for (ZoneChannel c : channels) {
                        c.resetTracks();
                    }
                }
                long began = System.nanoTime();
                stages.frame(t, previous, analysedFrames);
                long c0 = stages.clock();
                boolean estimated;
                boolean still = false;
                if (gate == null || gate.changed(f, t)) {
                    estimated = flow.push(f.pixels, field);
                } else {
                    still = true;
                    flow.pushStill(f.pixels, field); // the gate passes only after frames it has primed on
                    stillFrames++;
                    estimated = true;
                }
                long c1 = stages.flowDone(c0);
                previous = t;
                lastStreamSeconds = t;
                analysedFrames++;
                for (int z = 0; z < channels.size(); z++) {
                    Event h = channels.get(z).hours(t);
                    if (h != null) {
                        emit(h);
                    }
                }
                if (!estimated || dt <= 0 || dt > MAX_GAP_SECONDS) {
                    analysisNanos += System.nanoTime() - began;
                    continue;
                }
                live.offer(f, field, dt);
                for (int z = 0; z < channels.size(); z++) {
                    ZoneChannel c = channels.get(z);
                    Event e = c.update(field, f.pixels, still, dt, t, reading, learnedDir);
                    zoneFigures.read(z, reading);
                    if (readings != null) {
                        readings.reading(camera, z, reading, c.movers(), c.state());
                    }
                    if (e != null) {
                        if (e.phase() == Event.Phase.START) {
                            zoneFigures.started(z);
                        }
                        emit(evidence.name(e, c.zone(), c.heading(), f, field));
                    }
                }
                if (tamper != null) {
                    tamper.update(f, field, t);
                    for (Event e; (e = tamper.poll()) != null; ) {
                        tampered(e);
                    }
                }
                analysisNanos += System.nanoTime() - began;
                stages.zonesDone(c1);
                if (frames != null) {
                    frames.frame(this, f, field, t);
                }
            }
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        } catch (RuntimeException e) {
            LOG.error("camera {}: analysis stopped by an internal error", camera.id(), e);
        } finally {
            if (gate != null) {
                LOG.info("camera {}: flow skipped on {} of {} analysed frames (nothing changed around the zones;"
                        + " block noise {} grey levels)", camera.id(), stillFrames, analysedFrames,
                        String.format(java.util.Locale.ROOT, "%.2f", gate.noise()));
            }
            if (flow != null) {
                flow.close();
            }
            if (tamper != null) {
                tamper.finish(lastStreamSeconds);
                for (Event e; (e = tamper.poll()) != null; ) {
                    tampered(e);
                }
            }
            for (ZoneChannel c : channels) {
                Event e = c.finish(lastStreamSeconds);
                if (e != null) {
                    emit(evidence.name(e, c.zone(), c.heading(), null, field));
                }
            }
        }
    }

    /** Waits for this camera's clip writers to write their trailers (shutdown). */
    public void awaitClips(long timeoutMillis) throws InterruptedException {
        evidence.awaitClips(timeoutMillis);
    }

    /** A tamper event: the open conditions follow it (analysis thread), then it goes out. */
    private void tampered(Event e) {
        if (e.phase() == Event.Phase.START) {
            open.put(e.kind(), e.id());
        } else if (e.id().equals(open.get(e.kind()))) {
            open.remove(e.kind());
        }
        List<String> now = new ArrayList<>();
        for (wayward.event.EventKind k : open.keySet()) {
            now.add(k.jsonName());
        }
        conditions = List.copyOf(now);
        emit(e);
    }

    @Override
    public List<String> conditions() {
        return conditions;
    }

    private void emit(Event e) {
        LOG.info("camera {} zone {}: {} {} at stream {} s", e.camera(), e.zone(), e.kind().jsonName(),
                e.phase().jsonName(), String.format(java.util.Locale.ROOT, "%.2f", e.streamSeconds()));
        events.accept(e);
    }

    private void setUp(int w, int h) {
        if (flow != null) {
            flow.close();
        }
        flow = FlowEstimator.create(w, h, flowConfig.toSettings());
        field = flow.newField();
        for (ZoneChannel c : channels) {
            c.setUp(field);
        }
        if (flowConfig.skipStill()) {
            List<double[]> xs = new ArrayList<>();
            List<double[]> ys = new ArrayList<>();
            for (ZoneChannel c : channels) {
                xs.add(c.zone().xs());
                ys.add(c.zone().ys());
            }
            gate = new StillGate(xs, ys, w, h);
        }
        LOG.info("camera {}: analysing at {}x{}, {} pyramid levels, {}", camera.id(), w, h, flow.levelCount(),
                channels.size() == 1 ? "1 zone" : channels.size() + " zones");
    }
}
