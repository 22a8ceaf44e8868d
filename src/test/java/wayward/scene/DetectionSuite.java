package wayward.scene;

import static org.bytedeco.opencv.global.opencv_core.CV_8UC1;

import com.fasterxml.jackson.core.JsonFactory;
import com.fasterxml.jackson.core.JsonParser;
import com.fasterxml.jackson.core.JsonToken;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.PrintStream;
import java.nio.ByteBuffer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Clock;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.stream.Stream;
import org.bytedeco.ffmpeg.global.avutil;
import org.bytedeco.javacv.FFmpegFrameGrabber;
import org.bytedeco.javacv.Frame;
import org.bytedeco.opencv.global.opencv_video;
import org.bytedeco.opencv.opencv_core.Mat;
import org.bytedeco.opencv.opencv_video.BackgroundSubtractorMOG2;
import wayward.cli.Main;
import wayward.event.Event;
import wayward.rule.RuleSettings;
import wayward.rule.ZoneRule;
import wayward.zone.ZoneMask;
import wayward.zone.ZoneReading;

/**
 * The detection suite: renders every scenario in test-streams/suite with our generator (exact ground truth),
 * runs wayward's {@code replay} on it and, for comparison, a direction-blind baseline (OpenCV's MOG2
 * background subtraction through JavaCV, deciding "motion in zone" with the same hysteresis rule), and scores
 * both against the truth. Run {@link #main} for the table (DEVELOPERS.md, "Detection suite").
 */
public final class DetectionSuite {
    /** The default zone rule of the config (conf/wayward.example.toml), used by both detectors. */
    static final RuleSettings RULE = new RuleSettings(0.02, 0.008, 0.5, 1.0, 2.0);
    // (the baseline has no direction, so the travel conditions do not apply to it)
    /** A start this long after the passage's end still counts as catching it (the rule's clear time + slack). */
    static final double LATE_SECONDS = 1.5;

    /** One wrong-way passage from the truth: a mover inside a zone, moving against its heading. */
    record Passage(String mover, String zone, double enter, double exit) {
    }

    /** A detector's event: zone (null for camera events), kind and the start's stream time. */
    record Detection(String zone, String kind, double start) {
        Detection(String zone, double start) {
            this(zone, "wrong_way", start);
        }
    }

    /** Event kinds of the tamper watch. */
    static final java.util.Set<String> TAMPER = java.util.Set.of("view_blocked", "focus_lost", "picture_frozen",
            "camera_moved");

    /** A tamper alert counts when it starts within this long after the tampering. */
    static final double TAMPER_SECONDS = 5;

    /** The score of one detector on one scenario. */
    record Score(String scenario, boolean nuisance, double seconds, int passages, int caught, int events,
            int falseAlerts, double maxLatency, double meanLatency, String tamperExpected, boolean tamperCaught,
            int falseTamper) {
        double recall() {
            return passages == 0 ? Double.NaN : (double) caught / passages;
        }

        double precision() {
            return events == 0 ? Double.NaN : (double) (events - falseAlerts) / events;
        }
    }

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

    /** wayward's {@code replay} on the video with the scene's zones and default settings. */
    static List<Detection> wayward(Scene scene, Path video, Path work) throws IOException {
        StringBuilder toml = new StringBuilder("[service]\ndata_dir = \"data\"\nhttp = \"off\"\n[[camera]]\n")
                .append("id = \"suite\"\nsource = \"").append(video.toAbsolutePath()).append("\"\n");
        for (Scene.Zone z : scene.zones()) {
            toml.append("[[camera.zone]]\nid = \"").append(z.id()).append("\"\npolygon = [");
            for (int i = 0; i < z.xs().length; i++) {
                toml.append(i == 0 ? "" : ", ").append('[').append(z.xs()[i]).append(", ").append(z.ys()[i]).append(']');
            }
            toml.append("]\nheading_deg = ").append(z.headingDeg()).append("\ntolerance_deg = ")
                    .append(z.toleranceDeg()).append('\n');
        }
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
            if (!line.contains("\"phase\":\"start\"")) {
                continue;
            }
            String kind = field(line, "kind");
            if (kind.equals("wrong_way")) {
                found.add(new Detection(field(line, "zone"), kind, Double.parseDouble(field(line, "stream_s"))));
            } else if (TAMPER.contains(kind)) {
                found.add(new Detection(null, kind, Double.parseDouble(field(line, "stream_s"))));
            }
        }
        return found;
    }

    private static String field(String json, String name) throws IOException {
        try (JsonParser p = new JsonFactory().createParser(json)) {
            p.nextToken();
            while (p.nextToken() == JsonToken.FIELD_NAME) {
                String n = p.currentName();
                p.nextToken();
                if (n.equals(name)) {
                    return p.getText();
                }
            }
        }
        throw new IOException("no " + name + " in " + json);
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
                    r.coverage = m.size() == 0 ? 0 : (double) on / m.size();
                    r.against = 0;
                    r.speed = 0;
                    r.headingDeg = Double.NaN;
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

    /** Matches starts to passages (each start at most one passage, in time order), and tamper alerts. */
    static Score score(Scene scene, List<Passage> passages, List<Detection> all) {
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
        double sum = 0;
        double max = Double.NaN;
        for (Passage p : passages) {
            for (int i = 0; i < found.size(); i++) {
                Detection d = found.get(i);
                if (!used[i] && d.zone().equals(p.zone()) && d.start() >= p.enter() - 0.2
                        && d.start() <= p.exit() + LATE_SECONDS) {
                    used[i] = true;
                    caught++;
                    double latency = d.start() - p.enter() - RULE.holdSeconds();
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
                max, caught == 0 ? Double.NaN : sum / caught, expected, tamperCaught, falseTamper);
    }

    /** Both detectors on every scenario: {ours, baseline} per scenario. */
    public static List<Score[]> run(Path suiteDir, Path work) throws IOException {
        Files.createDirectories(work);
        List<Score[]> rows = new ArrayList<>();
        for (Path file : scenarios(suiteDir)) {
            Scene scene = Scene.load(file);
            Path video = render(file, work);
            List<Passage> passages = passages(scene);
            rows.add(new Score[] {score(scene, passages, wayward(scene, video, work)),
                    score(scene, passages, motionBaseline(scene, video))});
        }
        return rows;
    }

    private static String f(double v, String pattern) {
        return Double.isNaN(v) ? "–" : String.format(Locale.ROOT, pattern, v);
    }

    /** The table for DEVELOPERS.md (Markdown). */
    public static String table(List<Score[]> rows) {
        StringBuilder b = new StringBuilder();
        b.append("| scenario | wrong-way passages | wayward: caught | wayward: false alerts | wayward: latency "
                + "mean / max (s) | tamper expected → raised | MOG2 motion: caught | MOG2 motion: false alerts |\n");
        b.append("|---|---|---|---|---|---|---|---|\n");
        int passages = 0;
        int caught = 0;
        int events = 0;
        int falseAlerts = 0;
        int nuisanceFalse = 0;
        int baseCaught = 0;
        int baseEvents = 0;
        int baseFalse = 0;
        double seconds = 0;
        double maxLatency = Double.NaN;
        for (Score[] r : rows) {
            Score o = r[0];
            Score m = r[1];
            b.append("| ").append(o.scenario()).append(" | ").append(o.passages()).append(" | ")
                    .append(o.caught()).append(" | ").append(o.falseAlerts()).append(" | ")
                    .append(f(o.meanLatency(), "%.2f")).append(" / ").append(f(o.maxLatency(), "%.2f")).append(" | ")
                    .append(o.tamperExpected() == null ? "–" : o.tamperExpected() + (o.tamperCaught() ? " ✓" : " ✗"))
                    .append(o.falseTamper() > 0 ? " (+" + o.falseTamper() + " false)" : "").append(" | ")
                    .append(m.caught()).append(" | ").append(m.falseAlerts()).append(" |\n");
            passages += o.passages();
            caught += o.caught();
            events += o.events();
            falseAlerts += o.falseAlerts();
            nuisanceFalse += o.nuisance() ? o.falseAlerts() : 0;
            baseCaught += m.caught();
            baseEvents += m.events();
            baseFalse += m.falseAlerts();
            seconds += o.seconds();
            if (!Double.isNaN(o.maxLatency())) {
                maxLatency = Double.isNaN(maxLatency) ? o.maxLatency() : Math.max(maxLatency, o.maxLatency());
            }
        }
        double hours = seconds / 3600;
        b.append(String.format(Locale.ROOT, "%n**Overall** (%d scenarios, %.0f s of video): wayward recall %d/%d = "
                + "%.3f, precision %s, false alerts %d (%.0f per hour of video; %d in nuisance scenarios), "
                + "worst latency over the hold time %s s. MOG2 motion baseline: recall %d/%d, precision %s, false "
                + "alerts %d (%.0f per hour).%n", rows.size(), seconds, caught, passages,
                passages == 0 ? Double.NaN : (double) caught / passages,
                events == 0 ? "–" : String.format(Locale.ROOT, "%.3f", (double) (events - falseAlerts) / events),
                falseAlerts, falseAlerts / hours, nuisanceFalse, f(maxLatency, "%.2f"), baseCaught, passages,
                baseEvents == 0 ? "–" : String.format(Locale.ROOT, "%.3f", (double) (baseEvents - baseFalse) / baseEvents),
                baseFalse, baseFalse / hours));
        return b.toString();
    }

    /** Prints the table: {@code java -cp … wayward.scene.DetectionSuite [suite folder] [work folder]}. */
    public static void main(String[] args) throws IOException {
        Path suite = Path.of(args.length > 0 ? args[0] : "test-streams/suite");
        Path work = Path.of(args.length > 1 ? args[1] : "target/suite");
        System.out.print(table(run(suite, work)));
    }
}
