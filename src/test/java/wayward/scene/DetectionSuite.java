package wayward.scene;

import static org.bytedeco.opencv.global.opencv_core.CV_8UC1;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.PrintStream;
import java.nio.ByteBuffer;
import java.nio.FloatBuffer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Clock;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.stream.Stream;
import org.bytedeco.ffmpeg.global.avutil;
import org.bytedeco.ffmpeg.global.swscale;
import org.bytedeco.javacv.FFmpegFrameGrabber;
import org.bytedeco.javacv.Frame;
import org.bytedeco.opencv.global.opencv_core;
import org.bytedeco.opencv.global.opencv_video;
import org.bytedeco.opencv.opencv_core.Mat;
import org.bytedeco.opencv.opencv_video.BackgroundSubtractorMOG2;
import org.bytedeco.opencv.opencv_video.DISOpticalFlow;
import wayward.cli.Main;
import wayward.event.Event;
import wayward.rule.RuleSettings;
import wayward.rule.ZoneRule;
import wayward.testing.SchemaCheck;
import wayward.zone.ZoneMask;
import wayward.zone.ZoneMeter;
import wayward.zone.ZoneReading;

/**
 * The detection suite: renders every scenario of both halves of test-streams/suite ({@code tune}, where
 * defaults are chosen, and {@code held-out}, where they are scored) with our generator (exact ground truth),
 * runs wayward's {@code replay} on it and, for comparison, two references on the same video: a direction-blind
 * baseline (OpenCV's MOG2 background subtraction through JavaCV, deciding "motion in zone" with the same
 * hysteresis rule) and a direction-aware one (OpenCV's DIS optical flow, preset MEDIUM, through JavaCV, the share
 * of the zone moving against its heading decided by our {@link ZoneRule}), and scores all three against the
 * truth, each half on its own. Run {@link #main} for the tables (DEVELOPERS.md, "Detection suite").
 */
public final class DetectionSuite {
    /** The default zone rule of the config (conf/wayward.example.toml), used by both detectors. */
    static final RuleSettings RULE = new RuleSettings(0.02, 0.008, 0.5, 1.0, 2.0);
    // (the baseline has no direction, so the travel conditions do not apply to it)
    /**
     * The DIS reference's rule: onset at 1 % of the zone's pixels against the heading, held 0.3 s (release,
     * clear and rest as {@link #RULE}); no travel conditions.
     */
    static final RuleSettings DIS_RULE = new RuleSettings(0.01, 0.004, 0.3, 1.0, 2.0);
    /** The DIS reference counts a pixel as moving from this speed on, analysis px per second. */
    static final double DIS_MIN_SPEED = 8;
    /** The halves of the suite, in the order the tables show them. */
    static final List<String> HALVES = List.of("tune", "held-out");
    /** Analysis picture width and rate of the references, as wayward's defaults (conf/wayward.example.toml). */
    static final int ANALYSIS_WIDTH = 320;
    static final double ANALYSIS_FPS = 10;

    /** A start this long after the passage's end still counts as catching it (the rule's clear time + slack). */
    static final double LATE_SECONDS = 1.5;

    /** One wrong-way passage from the truth: a mover inside a zone, moving against its heading. */
    record Passage(String mover, String zone, double enter, double exit) {
    }

    /**
     * A detector's event: zone (null for camera events), kind, the start's stream time and, for wayward, where the
     * mover that started it was (the last point of {@code mover_path}, picture fractions; NaN for the references,
     * which have no mover).
     */
    record Detection(String zone, String kind, double start, double x, double y) {
        Detection(String zone, String kind, double start) {
            this(zone, kind, start, Double.NaN, Double.NaN);
        }

        Detection(String zone, double start) {
            this(zone, "wrong_way", start);
        }
    }

    /**
     * A catch is by the passage's own mover when the start's mover stands within half the mover's diagonal plus
     * this many pixels (the scene's) of where the script puts the mover's centre, at the start or up to
     * {@link #OWN_MOVER_LAG_SECONDS} before it: a plain body's centroid sits on its rims.
     */
    static final double OWN_MOVER_SLACK_PX = 12;
    /**
     * How far the start's mover position may lag the script: the flow places a group where its samples moved from
     * (one analysed frame back), three-frame differencing places a hop's footprint on the middle frame of three (one
     * more back); two analysed frames at the suite's 10 a second, and a little for their uneven spacing.
     */
    static final double OWN_MOVER_LAG_SECONDS = 0.25;

    /** Event kinds of the tamper watch. */
    static final java.util.Set<String> TAMPER = java.util.Set.of("view_blocked", "focus_lost", "picture_frozen",
            "camera_moved");

    /** A tamper alert counts when it starts within this long after the tampering. */
    static final double TAMPER_SECONDS = 5;

    /** One scenario's scores: wayward, the MOG2 baseline and the DIS-MEDIUM reference. */
    record Row(String half, Score ours, Score mog2, Score dis) {
    }

    /** The score of one detector on one scenario; latencies are start − entry − the detector's hold time. */
    record Score(String scenario, boolean nuisance, double seconds, int passages, int caught, int events,
            int falseAlerts, double maxLatency, double meanLatency, String tamperExpected, boolean tamperCaught,
            int falseTamper, int caughtByOwnMover) {
        double recall() {
            return passages == 0 ? Double.NaN : (double) caught / passages;
        }

        double precision() {
            return events == 0 ? Double.NaN : (double) (events - falseAlerts) / events;
        }
    }

    private static final ObjectMapper MAPPER = new ObjectMapper();

    private DetectionSuite() {
    }

    public static List<Path> scenarios(Path suiteDir) throws IOException {
        try (Stream<Path> s = Files.walk(suiteDir)) {
            return s.filter(p -> p.getFileName().toString().endsWith(".scene.toml")).sorted().toList();
        }
    }

    /** Renders a scenario (video + truth) into {@code work}; returns the video. */
    static Path render(Path sceneFile, Path work) throws IOException {
        Scene scene = Scene.load(sceneFile);
        Path video = work.resolve(scene.name() + ".mp4");
        Path truth = work.resolve(scene.name() + ".truth.json");
        if (!Files.exists(video) || Files.getLastModifiedTime(video).compareTo(Files.getLastModifiedTime(sceneFile)) < 0) {
            new SceneGenerator(scene).write(video, truth);
        }
        return video;
    }

    static List<Passage> passages(Scene scene) {
        List<Passage> out = new ArrayList<>();
        for (Scene.Mover m : scene.movers()) {
            for (Scene.Zone z : scene.zones()) {
                for (double[] iv : m.againstIntervals(z, 1.0 / scene.fps(), scene.width(), scene.height(),
                        SceneGenerator.AGAINST_MIN_SPEED)) {
                    out.add(new Passage(m.id(), z.id(), iv[0], iv[1]));
                }
            }
        }
        out.sort((a, b) -> Double.compare(a.enter(), b.enter()));
        return out;
    }

    /**
     * The config wayward's {@code replay} runs a scene's video with: its zones and default settings, and the
     * {@code [flow]} key of {@code -Dsuite.flow="key = value"} for a side-by-side run (e.g. skip_still = false).
     */
    static String config(Scene scene, Path video) {
        StringBuilder toml = new StringBuilder("[service]\ndata_dir = \"data\"\nhttp = \"off\"\n");
        String flow = System.getProperty("suite.flow");
        if (flow != null) {
            toml.append("[flow]\n").append(flow).append('\n');
        }
        toml.append("[[camera]]\nid = \"suite\"\nsource = \"").append(video.toAbsolutePath()).append("\"\n");
        for (Scene.Zone z : scene.zones()) {
            toml.append("[[camera.zone]]\nid = \"").append(z.id()).append("\"\npolygon = [");
            for (int i = 0; i < z.xs().length; i++) {
                toml.append(i == 0 ? "" : ", ").append('[').append(z.xs()[i]).append(", ").append(z.ys()[i]).append(']');
            }
            toml.append("]\nheading_deg = ").append(z.headingDeg()).append("\ntolerance_deg = ")
                    .append(z.toleranceDeg()).append('\n');
        }
        return toml.toString();
    }

    /** wayward's {@code replay} on the video with the scene's zones and default settings. */
    static List<Detection> wayward(Scene scene, Path video, Path work) throws IOException {
        String toml = config(scene, video);
        Path config = work.resolve(scene.name() + ".toml");
        Files.writeString(config, toml);
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        ByteArrayOutputStream err = new ByteArrayOutputStream();
        int rc = Main.execute(new String[] {"replay", "--config", config.toString(), "--input", video.toString()},
                new PrintStream(out, true, StandardCharsets.UTF_8), new PrintStream(err, true, StandardCharsets.UTF_8));
        if (rc != 0) {
            throw new IOException("replay of " + video + " ended with " + rc + ": " + err);
        }
        List<Detection> found = new ArrayList<>();
        for (String line : out.toString(StandardCharsets.UTF_8).split("\n")) {
            if (!line.isBlank()) {
                SchemaCheck.assertEventRecord(line); // every record of the suite fits the shipped schema
            }
            if (!line.contains("\"phase\":\"start\"")) {
                continue;
            }
            JsonNode event = MAPPER.readTree(line);
            String kind = event.path("kind").asText();
            double start = event.path("stream_s").asDouble(Double.NaN);
            if (kind.equals("wrong_way")) {
                JsonNode path = event.path("mover_path");
                JsonNode last = path.isEmpty() ? null : path.get(path.size() - 1);
                found.add(new Detection(event.path("zone").asText(), kind, start,
                        last == null ? Double.NaN : last.get(0).asDouble(), last == null ? Double.NaN : last.get(1).asDouble()));
            } else if (TAMPER.contains(kind)) {
                found.add(new Detection(null, kind, start));
            }
        }
        return found;
    }

    /**
     * The direction-blind baseline: OpenCV MOG2 (default history 500, variance threshold 16, shadows marked
     * 127 and not counted) on the same 320-wide gray frames; the share of a zone's pixels in the foreground is
     * the signal of the same hysteresis rule a zone without heading uses.
     */
    static List<Detection> motionBaseline(Scene scene, Path video) throws IOException {
        List<Detection> found = new ArrayList<>();
        int w = 320;
        int h = (int) Math.round(320.0 * scene.height() / scene.width() / 2) * 2;
        try (FFmpegFrameGrabber g = new FFmpegFrameGrabber(video.toFile())) {
            g.setPixelFormat(avutil.AV_PIX_FMT_GRAY8);
            g.setImageWidth(w);
            g.setImageHeight(h);
            g.start();
            BackgroundSubtractorMOG2 mog = opencv_video.createBackgroundSubtractorMOG2();
            List<ZoneMask> masks = new ArrayList<>();
            List<ZoneRule> rules = new ArrayList<>();
            for (Scene.Zone z : scene.zones()) {
                masks.add(ZoneMask.rasterise(z.xs(), z.ys(), w, h));
                rules.add(new ZoneRule("suite", z.id(), false, RULE, Clock.systemUTC()));
            }
            Mat frame = new Mat(h, w, CV_8UC1);
            Mat fg = new Mat();
            byte[] pixels = new byte[w * h];
            byte[] fgPixels = new byte[w * h];
            ZoneReading r = new ZoneReading();
            int index = 0;
            Frame f;
            while ((f = g.grabImage()) != null) {
                ByteBuffer b = (ByteBuffer) f.image[0];
                for (int y = 0; y < h; y++) {
                    b.position(y * f.imageStride);
                    b.get(pixels, y * w, w);
                }
                frame.data().put(pixels, 0, pixels.length);
                mog.apply(frame, fg);
                fg.data().get(fgPixels, 0, fgPixels.length);
                double t = index++ / scene.fps();
                for (int z = 0; z < masks.size(); z++) {
                    ZoneMask m = masks.get(z);
                    int on = 0;
                    for (int k = 0; k < m.size(); k++) {
                        if ((fgPixels[m.pixel(k)] & 0xff) == 255) {
                            on++;
                        }
                    }
                    r.streamSeconds = t;
                    r.movingShare = m.size() == 0 ? 0 : (double) on / m.size();
                    r.againstShare = 0;
                    r.movingSpeedPxPerSecond = 0;
                    r.movingBearingDeg = Double.NaN;
                    Event e = rules.get(z).update(r);
                    if (e != null && e.phase() == Event.Phase.START) {
                        found.add(new Detection(scene.zones().get(z).id(), t));
                    }
                }
            }
            g.stop();
        }
        return found;
    }

    /** The analysed frames at 320 wide and 10 fps, as wayward's capture picks them (VideoSource: due times). */
    interface FrameSink {
        void frame(byte[] pixels, int w, int h, double streamSeconds);
    }

    static void analysedFrames(Scene scene, Path video, FrameSink sink) throws IOException {
        int w = ANALYSIS_WIDTH;
        int h = (int) Math.round(ANALYSIS_WIDTH * (double) scene.height() / scene.width() / 2) * 2;
        try (FFmpegFrameGrabber g = new FFmpegFrameGrabber(video.toFile())) {
            g.setPixelFormat(avutil.AV_PIX_FMT_GRAY8);
            g.setImageWidth(w);
            g.setImageHeight(h);
            g.setImageScalingFlags(swscale.SWS_AREA);
            g.start();
            byte[] pixels = new byte[w * h];
            double nextDue = 0;
            double interval = 1 / ANALYSIS_FPS;
            int index = 0;
            Frame f;
            while ((f = g.grabImage()) != null) {
                double t = index++ / scene.fps();
                if (t + 1e-6 < nextDue) {
                    continue;
                }
                nextDue = Math.max(nextDue + interval, t + interval * 0.5);
                ByteBuffer b = (ByteBuffer) f.image[0];
                for (int y = 0; y < h; y++) {
                    b.position(y * f.imageStride);
                    b.get(pixels, y * w, w);
                }
                sink.frame(pixels, w, h, t);
            }
            g.stop();
        }
    }

    /**
     * The direction-aware reference: OpenCV DIS optical flow (Kroeger et al. 2016), preset MEDIUM, through
     * JavaCV, on every analysed frame pair (320 wide, 10 fps). Per zone the signal is the share of its pixels
     * whose flow is at least {@link #DIS_MIN_SPEED} px/s and lies within the zone's tolerance of the opposite
     * of its heading; our {@link ZoneRule} with {@link #DIS_RULE} decides the events.
     */
    static List<Detection> disReference(Scene scene, Path video) throws IOException {
        List<Detection> found = new ArrayList<>();
        opencv_core.setNumThreads(1);
        try (DISOpticalFlow dis = DISOpticalFlow.create(DISOpticalFlow.PRESET_MEDIUM)) {
            List<ZoneMask> masks = new ArrayList<>();
            List<ZoneRule> rules = new ArrayList<>();
            ZoneReading r = new ZoneReading();
            Mat[] previous = {null};
            double[] previousT = {0};
            analysedFrames(scene, video, (pixels, w, h, t) -> {
                if (masks.isEmpty()) {
                    for (Scene.Zone z : scene.zones()) {
                        masks.add(ZoneMask.rasterise(z.xs(), z.ys(), w, h));
                        rules.add(new ZoneRule("suite", z.id(), true, DIS_RULE, Clock.systemUTC()));
                    }
                }
                Mat frame = new Mat(h, w, CV_8UC1);
                frame.data().put(pixels, 0, pixels.length);
                if (previous[0] != null) {
                    double dt = t - previousT[0];
                    try (Mat flow = new Mat()) { // a new output every call: DIS would start from the old one
                        dis.calc(previous[0], frame, flow);
                        FloatBuffer fb = flow.createBuffer();
                        for (int z = 0; z < masks.size(); z++) {
                            ZoneMask m = masks.get(z);
                            Scene.Zone zone = scene.zones().get(z);
                            int against = 0;
                            double su = 0;
                            double sv = 0;
                            for (int k = 0; k < m.size(); k++) {
                                int p = m.pixel(k);
                                double u = fb.get(2 * p) / dt;
                                double v = fb.get(2 * p + 1) / dt;
                                if (Math.hypot(u, v) >= DIS_MIN_SPEED && zone.isAgainst(ZoneMeter.bearingDeg(u, v))) {
                                    against++;
                                    su += u;
                                    sv += v;
                                }
                            }
                            r.streamSeconds = t;
                            r.againstShare = m.size() == 0 ? 0 : (double) against / m.size();
                            r.movingShare = r.againstShare;
                            r.movingSpeedPxPerSecond = against == 0 ? 0 : Math.hypot(su, sv) / against;
                            r.movingBearingDeg = against == 0 ? Double.NaN : ZoneMeter.bearingDeg(su, sv);
                            r.againstSpeedPxPerSecond = r.movingSpeedPxPerSecond;
                            r.againstBearingDeg = r.movingBearingDeg;
                            Event e = rules.get(z).update(r);
                            if (e != null && e.phase() == Event.Phase.START) {
                                found.add(new Detection(zone.id(), t));
                            }
                        }
                    }
                    previous[0].close();
                }
                previous[0] = frame;
                previousT[0] = t;
            });
            if (previous[0] != null) {
                previous[0].close();
            }
        }
        return found;
    }

    /**
     * Matches starts to passages (each start at most one passage, in time order), and tamper alerts; placesMovers:
     * the detector says where each start's mover stood (wayward), so catches by the passage's own mover are counted.
     */
    static Score score(Scene scene, List<Passage> passages, List<Detection> all, double holdSeconds,
            boolean placesMovers) {
        List<Detection> found = all.stream().filter(d -> d.kind().equals("wrong_way") || d.kind().equals("motion"))
                .toList();
        Scene.Nuisances nu = scene.nuisances();
        String expected = nu.tamper() != null ? nu.tamper().expectedEvent() : nu.bump() != null ? "camera_moved" : null;
        double expectedAt = nu.tamper() != null ? nu.tamper().atSeconds() : nu.bump() != null ? nu.bump().atSeconds() : 0;
        boolean tamperCaught = false;
        int falseTamper = 0;
        for (Detection d : all) {
            if (!TAMPER.contains(d.kind())) {
                continue;
            }
            if (!tamperCaught && d.kind().equals(expected) && d.start() >= expectedAt
                    && d.start() <= expectedAt + TAMPER_SECONDS) {
                tamperCaught = true;
            } else {
                falseTamper++;
            }
        }
        boolean[] used = new boolean[found.size()];
        int caught = 0;
        int own = 0;
        double sum = 0;
        double max = Double.NaN;
        for (Passage p : passages) {
            for (int i = 0; i < found.size(); i++) {
                Detection d = found.get(i);
                if (!used[i] && d.zone().equals(p.zone()) && d.start() >= p.enter() - 0.2
                        && d.start() <= p.exit() + LATE_SECONDS) {
                    used[i] = true;
                    caught++;
                    own += ownMover(scene, p, d) ? 1 : 0;
                    double latency = d.start() - p.enter() - holdSeconds;
                    sum += latency;
                    max = Double.isNaN(max) ? latency : Math.max(max, latency);
                    break;
                }
            }
        }
        int falseAlerts = 0;
        for (boolean u : used) {
            if (!u) {
                falseAlerts++;
            }
        }
        boolean nuisance = passages.isEmpty();
        return new Score(scene.name(), nuisance, scene.seconds(), passages.size(), caught, found.size(), falseAlerts,
                max, caught == 0 ? Double.NaN : sum / caught, expected, tamperCaught, falseTamper, placesMovers ? own : -1);
    }

    /** Whether a start matched to a passage was started by the passage's own mover ({@link #OWN_MOVER_SLACK_PX}). */
    static boolean ownMover(Scene scene, Passage p, Detection d) {
        if (Double.isNaN(d.x())) {
            return false;
        }
        for (Scene.Mover m : scene.movers()) {
            if (!m.id().equals(p.mover())) {
                continue;
            }
            for (double lag = 0; lag <= OWN_MOVER_LAG_SECONDS + 1e-9; lag += 0.01) {
                double t = Math.max(m.startSeconds(), d.start() - lag);
                double[] c = m.centreAt(t);
                double[] size = m.sizeAt(t);
                double reach = 0.5 * Math.hypot(size[0] * scene.width(), size[1] * scene.height()) + OWN_MOVER_SLACK_PX;
                if (Math.hypot((d.x() - c[0]) * scene.width(), (d.y() - c[1]) * scene.height()) <= reach) {
                    return true;
                }
            }
            return false;
        }
        return false;
    }

    /** The three detectors on every scenario of both halves, in table order (tune first). */
    public static List<Row> run(Path suiteDir, Path work) throws IOException {
        return run(suiteDir, work, HALVES);
    }

    /** The three detectors on every scenario of the given sets (folders of the suite), in that order. */
    static List<Row> run(Path suiteDir, Path work, List<String> halves) throws IOException {
        List<Row> rows = new ArrayList<>();
        for (String half : halves) {
            Path dir = work.resolve(half);
            Files.createDirectories(dir);
            for (Path file : scenarios(suiteDir.resolve(half))) {
                rows.add(run(half, file, dir));
            }
        }
        return rows;
    }

    /** The three detectors on one scenario (rendered into {@code work} unless already there). */
    static Row run(String half, Path file, Path work) throws IOException {
        Scene scene = Scene.load(file);
        Path video = render(file, work);
        List<Passage> passages = passages(scene);
        return new Row(half, score(scene, passages, wayward(scene, video, work), RULE.holdSeconds(), true),
                score(scene, passages, motionBaseline(scene, video), RULE.holdSeconds(), false),
                score(scene, passages, disReference(scene, video), DIS_RULE.holdSeconds(), false));
    }

    private static String f(double v, String pattern) {
        return Double.isNaN(v) ? "–" : String.format(Locale.ROOT, pattern, v);
    }

    /** Totals of one detector over one half. */
    record Totals(int scenarios, double seconds, int passages, int caught, int events, int falseAlerts,
            int nuisanceScenes, int nuisanceFalse, double meanLatency, double maxLatency, int caughtByOwnMover) {
        static Totals of(List<Score> scores) {
            int passages = 0;
            int caught = 0;
            int events = 0;
            int falseAlerts = 0;
            int nuisanceScenes = 0;
            int nuisanceFalse = 0;
            double seconds = 0;
            double sum = 0;
            double max = Double.NaN;
            int own = 0;
            boolean placed = false;
            for (Score o : scores) {
                if (o.caughtByOwnMover() >= 0) {
                    own += o.caughtByOwnMover();
                    placed = true;
                }
                passages += o.passages();
                caught += o.caught();
                events += o.events();
                falseAlerts += o.falseAlerts();
                nuisanceScenes += o.nuisance() ? 1 : 0;
                nuisanceFalse += o.nuisance() ? o.falseAlerts() : 0;
                seconds += o.seconds();
                if (!Double.isNaN(o.maxLatency())) {
                    max = Double.isNaN(max) ? o.maxLatency() : Math.max(max, o.maxLatency());
                    sum += o.meanLatency() * o.caught();
                }
            }
            return new Totals(scores.size(), seconds, passages, caught, events, falseAlerts, nuisanceScenes,
                    nuisanceFalse, caught == 0 ? Double.NaN : sum / caught, max, placed ? own : -1);
        }

        double recall() {
            return passages == 0 ? Double.NaN : (double) caught / passages;
        }

        double precision() {
            return events == 0 ? Double.NaN : (double) (events - falseAlerts) / events;
        }
    }

    /** The tables for DEVELOPERS.md (Markdown): one per half, then the summary of both halves. */
    public static String table(List<Row> rows) {
        StringBuilder b = new StringBuilder();
        List<String> halves = rows.stream().map(Row::half).distinct().toList();
        for (String half : halves) {
            List<Row> in = rows.stream().filter(r -> r.half().equals(half)).toList();
            if (in.isEmpty()) {
                continue;
            }
            b.append("\n**").append(half).append("** (").append(in.size()).append(" scenarios)\n\n");
            b.append("| scenario | wrong-way passages | wayward: caught | wayward: false alerts | wayward: latency "
                    + "mean / max (s) | tamper expected → raised | MOG2 motion: caught / false | DIS-MEDIUM: caught "
                    + "/ false | DIS-MEDIUM: latency mean / max (s) |\n");
            b.append("|---|---|---|---|---|---|---|---|---|\n");
            for (Row r : in) {
                Score o = r.ours();
                Score m = r.mog2();
                Score d = r.dis();
                b.append("| ").append(o.scenario()).append(" | ").append(o.passages()).append(" | ")
                        .append(o.caught()).append(o.caughtByOwnMover() >= 0 && o.caughtByOwnMover() < o.caught()
                                ? " (" + (o.caught() - o.caughtByOwnMover()) + " by another mover)" : "")
                        .append(" | ").append(o.falseAlerts()).append(" | ")
                        .append(f(o.meanLatency(), "%.2f")).append(" / ").append(f(o.maxLatency(), "%.2f")).append(" | ")
                        .append(o.tamperExpected() == null ? "–" : o.tamperExpected() + (o.tamperCaught() ? " ✓" : " ✗"))
                        .append(o.falseTamper() > 0 ? " (+" + o.falseTamper() + " false)" : "").append(" | ")
                        .append(m.caught()).append(" / ").append(m.falseAlerts()).append(" | ")
                        .append(d.caught()).append(" / ").append(d.falseAlerts()).append(" | ")
                        .append(f(d.meanLatency(), "%.2f")).append(" / ").append(f(d.maxLatency(), "%.2f")).append(" |\n");
            }
        }
        b.append("\n| half | detector | recall | precision | false alerts (per hour) | nuisance scenes with a false "
                + "alert | onset latency over hold, mean / max (s) |\n|---|---|---|---|---|---|---|\n");
        for (String half : halves) {
            List<Row> in = rows.stream().filter(r -> r.half().equals(half)).toList();
            if (in.isEmpty()) {
                continue;
            }
            summary(b, half, "wayward (hold " + RULE.holdSeconds() + " s)", Totals.of(in.stream().map(Row::ours).toList()),
                    in.stream().map(Row::ours).toList());
            summary(b, half, "MOG2 motion (hold " + RULE.holdSeconds() + " s)", Totals.of(in.stream().map(Row::mog2).toList()),
                    in.stream().map(Row::mog2).toList());
            summary(b, half, "DIS-MEDIUM reference (hold " + DIS_RULE.holdSeconds() + " s)",
                    Totals.of(in.stream().map(Row::dis).toList()), in.stream().map(Row::dis).toList());
        }
        return b.toString();
    }

    private static void summary(StringBuilder b, String half, String name, Totals t, List<Score> scores) {
        long nuisanceWithFalse = scores.stream().filter(s -> s.nuisance() && s.falseAlerts() > 0).count();
        b.append(String.format(Locale.ROOT, "| %s | %s | %d/%d = %s%s | %s | %d (%.0f) | %d of %d (%d alerts) | %s / %s |%n",
                half, name, t.caught(), t.passages(), f(t.recall(), "%.3f"),
                t.caughtByOwnMover() < 0 ? "" : " (by its own mover: " + t.caughtByOwnMover() + ")",
                f(t.precision(), "%.3f"),
                t.falseAlerts(), t.falseAlerts() / (t.seconds() / 3600), nuisanceWithFalse, t.nuisanceScenes(),
                t.nuisanceFalse(), f(t.meanLatency(), "%.2f"), f(t.maxLatency(), "%.2f")));
    }

    /**
     * Prints the tables: {@code java -cp … wayward.scene.DetectionSuite [suite folder] [work folder] [set …]}, the
     * sets being folders of the suite (default: tune and held-out; e.g. {@code probe}).
     */
    public static void main(String[] args) throws IOException {
        Path suite = Path.of(args.length > 0 ? args[0] : "test-streams/suite");
        Path work = Path.of(args.length > 1 ? args[1] : "target/suite");
        List<String> halves = args.length > 2 ? List.of(args).subList(2, args.length) : HALVES;
        System.out.print(table(run(suite, work, halves)));
    }
}
