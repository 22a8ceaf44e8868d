package wayward.scene;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import wayward.cli.Main;
import wayward.event.Event;

/**
 * Chooses the mover rule's defaults on one half of the detection suite: replays every scene of the half once with
 * {@code --report} (into target/tune/HALF), then re-runs only the rule ({@code what-if}) with each variant of
 * settings given on the command line, and prints per scene caught / false alerts / worst latency over the hold
 * and the totals. {@code java -cp … wayward.scene.MoverTuning tune [min_travel_px=15,hold_seconds=0.7 …]};
 * {@code -Dnoreplay=true} reuses the reports, {@code -Devents=1} lists the starts and passages. Not a test.
 *
 * <p>{@code -Dseed.shift=N} scores the same scenes with another noise: every scene's {@code seed} plus N (sensor
 * noise, rain, flakes, sway and the encoder's input all come from it; the script, and so the truth, stays), rendered
 * into target/tune/HALF+seedN. A default that holds only on the one noise it was chosen on is fitted to that noise;
 * shifted seeds of the tune half are new footage of the same scenes, which no default has seen, and keep the
 * held-out half out of the choice.
 */
public final class MoverTuning {
    private MoverTuning() {
    }

    public static void main(String[] args) throws Exception {
        String half = args[0];
        int seedShift = Integer.getInteger("seed.shift", 0);
        Path work = Path.of("target/tune").resolve(seedShift == 0 ? half : half + "+seed" + seedShift);
        Files.createDirectories(work);
        boolean replay = !System.getProperty("noreplay", "false").equals("true");
        List<Path> files = DetectionSuite.scenarios(Path.of("test-streams/suite").resolve(half));
        if (seedShift != 0) {
            files = shiftSeeds(files, work.resolve("scenes"), seedShift);
        }
        String only = System.getProperty("only");
        List<Map<String, Double>> variants = new ArrayList<>();
        variants.add(Map.of());
        for (int i = 1; i < args.length; i++) {
            Map<String, Double> m = new LinkedHashMap<>();
            for (String kv : args[i].split(",")) {
                String[] p = kv.split("=");
                m.put(p[0], Double.parseDouble(p[1]));
            }
            variants.add(m);
        }
        int[][] tot = new int[variants.size()][4];
        double[] maxLat = new double[variants.size()];
        Arrays.fill(maxLat, Double.NEGATIVE_INFINITY);
        for (Path file : files) {
            Scene scene = Scene.load(file);
            if (only != null && !scene.name().contains(only)) continue;
            Path video = DetectionSuite.render(file, work);
            Path report = work.resolve(scene.name() + "-report");
            if (replay || !Files.exists(report)) {
                String toml = DetectionSuite.config(scene, video);
                Path config = work.resolve(scene.name() + ".toml");
                Files.writeString(config, toml);
                ByteArrayOutputStream out = new ByteArrayOutputStream();
                ByteArrayOutputStream err = new ByteArrayOutputStream();
                int rc = Main.execute(new String[] {"replay", "--config", config.toString(), "--input", video.toString(),
                        "--report", report.toString()}, new PrintStream(out, true, StandardCharsets.UTF_8),
                        new PrintStream(err, true, StandardCharsets.UTF_8));
                if (rc != 0) throw new IOException(err.toString(StandardCharsets.UTF_8));
            }
            List<DetectionSuite.Passage> passages = DetectionSuite.passages(scene);
            StringBuilder line = new StringBuilder(String.format("%-40s p=%d", scene.name(), passages.size()));
            for (int v = 0; v < variants.size(); v++) {
                List<DetectionSuite.Detection> det = new ArrayList<>();
                for (Event e : wayward.report.WhatIf.run(report, variants.get(v))) {
                    if (e.phase() == Event.Phase.START) {
                        double[] path = e.mover() == null ? new double[0] : e.mover().path();
                        det.add(new DetectionSuite.Detection(e.zone(), "wrong_way", e.streamSeconds(),
                                path.length < 2 ? Double.NaN : path[path.length - 2],
                                path.length < 2 ? Double.NaN : path[path.length - 1]));
                    }
                }
                double hold = variants.get(v).getOrDefault("hold_seconds", 0.5);
                DetectionSuite.Score s = DetectionSuite.score(scene, passages, det, hold, true);
                tot[v][0] += s.passages(); tot[v][1] += s.caught(); tot[v][2] += s.falseAlerts(); tot[v][3] += s.events();
                if (s.caught() > 0) maxLat[v] = Math.max(maxLat[v], s.maxLatency());
                if (s.caughtByOwnMover() >= 0 && s.caughtByOwnMover() < s.caught()) {
                    line.append(" OTHER-MOVER=").append(s.caught() - s.caughtByOwnMover());
                }
                line.append(String.format(" | c=%d f=%d lat=%s", s.caught(), s.falseAlerts(),
                        s.caught() > 0 ? String.format("%.2f", s.maxLatency()) : "-"));
                if (System.getProperty("events") != null && v == 0) {
                    for (DetectionSuite.Detection d : det) line.append(" @").append(String.format("%.2f", d.start()));
                    for (DetectionSuite.Passage p : passages) line.append(String.format(" [%.2f-%.2f]", p.enter(), p.exit()));
                }
            }
            System.out.println(line);
        }
        for (int v = 0; v < variants.size(); v++) {
            System.out.printf("TOTAL %s: caught %d/%d false %d events %d maxlat %.2f%n", variants.get(v), tot[v][1], tot[v][0], tot[v][2], tot[v][3], maxLat[v]);
        }
    }

    private static final Pattern SEED = Pattern.compile("(?m)^seed\\s*=\\s*(\\d+)\\s*$");

    /**
     * Copies of the scene files into {@code dir} with their seed plus {@code shift}; a copy is rewritten only when it
     * differs, so its video is rendered again only then.
     */
    static List<Path> shiftSeeds(List<Path> files, Path dir, int shift) throws IOException {
        Files.createDirectories(dir);
        List<Path> out = new ArrayList<>();
        for (Path f : files) {
            String text = Files.readString(f);
            Matcher m = SEED.matcher(text);
            if (!m.find()) {
                throw new IOException(f + ": no seed line (expected `seed = N` to shift by " + shift + ")");
            }
            String shifted = m.replaceFirst("seed = " + (Long.parseLong(m.group(1)) + shift));
            Path copy = dir.resolve(f.getFileName());
            if (!Files.exists(copy) || !Files.readString(copy).equals(shifted)) {
                Files.writeString(copy, shifted);
            }
            out.add(copy);
        }
        return out;
    }
}
