package wayward.cli;

import java.io.PrintStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Set;
import wayward.analysis.CameraConfig;
import wayward.config.ConfigLoader;
import wayward.config.SiteConfig;
import wayward.service.Service;
import wayward.analysis.StageFigures;

/** CPU cost per camera and stage on a recorded file, to size a server. */
final class BenchCommand extends Command {
    /** Stream seconds not counted at the start of a bench run by default (JIT warm-up). */
    static final double DEFAULT_WARM_UP_SECONDS = 5;

    BenchCommand() {
        super("bench", Set.of("--input", "--analysis-input", "--cameras", "--config", "--warm-up"),
                String.join("\n",
                "usage: java -jar wayward.jar bench --input VIDEO [--analysis-input VIDEO] [--cameras N] [--config FILE]",
                "                                   [--warm-up SECONDS]",
                "",
                "Runs N cameras (default 1) on the same file at full speed, every frame decoded and analysed at the",
                "analysis rate, and prints per camera the CPU time of each stage (decode; luma and downscale; flow;",
                "zones and rules), the CPU a second of video costs, and its ratio to the decode stage (which skips",
                "H.264's deblocking filter; `ffmpeg -threads 1 -benchmark -i VIDEO -f null -` shows a full decode).",
                "The first 5 s of stream (--warm-up) are JIT warm-up and not counted: the optimising compiler takes",
                "the flow's vector loops only after 100 to 200 analysed frames, so on a recording of a few minutes",
                "--warm-up 60 gives the steady cost. With --config, the first camera's zones and settings are used;",
                "without, one zone over the middle of the picture with the default settings. CPU times are the",
                "threads' own (ThreadMXBean).",
                "",
                "With --analysis-input (a camera's smaller sub-stream of the same scene), the analysis decodes that",
                "file and --input is only demuxed, as a camera with analysis_source runs; the table then shows the",
                "main stream's demux cost too, and CPU per video second includes it."));
    }

    @Override
    int run(Options o, PrintStream out, PrintStream err) throws Exception {
        String input = o.required("--input", "VIDEO", "", err);
        if (!Files.isRegularFile(Path.of(input))) {
            err.println("wayward bench: --input " + input + ": file not found");
            return Main.NO_INPUT;
        }
        String analysisInput = o.has("--analysis-input") ? o.get("--analysis-input") : null;
        if (analysisInput != null && !Files.isRegularFile(Path.of(analysisInput))) {
            err.println("wayward bench: --analysis-input " + analysisInput + ": file not found");
            return Main.NO_INPUT;
        }
        String analysisVideo = analysisInput == null ? null : Path.of(analysisInput).toAbsolutePath().toString();
        int n = 1;
        if (o.has("--cameras")) {
            try {
                n = Integer.parseInt(o.get("--cameras"));
            } catch (NumberFormatException e) {
                n = 0;
            }
            if (n < 1 || n > 64) {
                err.println("wayward bench: --cameras " + o.get("--cameras") + " (expected a whole number from 1 to 64)");
                return Main.USAGE;
            }
        }
        double warmup = DEFAULT_WARM_UP_SECONDS;
        if (o.has("--warm-up")) {
            try {
                warmup = Double.parseDouble(o.get("--warm-up"));
            } catch (NumberFormatException e) {
                warmup = -1;
            }
            if (!(warmup >= 0 && warmup <= 3600)) {
                err.println("wayward bench: --warm-up " + o.get("--warm-up") + " (expected seconds from 0 to 3600)");
                return Main.USAGE;
            }
        }
        SiteConfig c;
        String video = Path.of(input).toAbsolutePath().toString();
        if (o.has("--config")) {
            c = o.config(null, err);
        } else {
            Path tmp = Files.createTempFile("wayward-bench", ".toml");
            Files.writeString(tmp, "[service]\nhttp = \"off\"\n[[camera]]\nid = \"bench\"\nsource = \""
                    + video.replace("\\", "\\\\") + "\"\n[[camera.zone]]\nid = \"middle\"\n"
                    + "polygon = [[0.25, 0.25], [0.75, 0.25], [0.75, 0.75], [0.25, 0.75]]\nheading_deg = 0\n");
            try {
                c = ConfigLoader.load(tmp);
            } finally {
                Files.deleteIfExists(tmp);
            }
        }
        CameraConfig first = c.cameras().get(0);
        List<CameraConfig> copies = new ArrayList<>();
        for (int i = 1; i <= n; i++) {
            CameraConfig copy = first.withSources(video, analysisVideo, false);
            copies.add(new CameraConfig(first.id() + "-" + i, copy.source(), false, copy.analysisWidth(),
                    copy.analysisFps(), copy.removeCameraMotion(), copy.input(), copy.zones(), copy.tamperAlerts(),
                    copy.analysisSource()));
        }
        Service s = new Service(c, copies, Service.Mode.REPLAY, new PrintStream(java.io.OutputStream.nullOutputStream()), 0);
        // the first seconds of stream are JIT warm-up: each camera counts only from there on
        s.measureStages(warmup);
        long wall = System.nanoTime();
        s.start();
        boolean terminal = System.console() != null;
        int cams = n;
        while (!s.awaitEnd(1, java.util.concurrent.TimeUnit.SECONDS)) {
            if (terminal) {
                // progress on a terminal only; quiet in logs and CI
                var p = s.pipelines().get(0);
                err.printf(java.util.Locale.ROOT, "\rbench: %d cameras, stream %.1f s, %.0f frames/s each   ", cams,
                        p.streamSeconds(), p.framesIn() / Math.max(1e-3, (System.nanoTime() - wall) / 1e9));
            }
        }
        if (terminal) {
            err.println();
        }
        s.stop();
        double wallSeconds = (System.nanoTime() - wall) / 1e9;
        if (s.pipelines().stream().anyMatch(p -> p.stageFigures().analysedFrames() == 0)) {
            err.println(String.format(java.util.Locale.ROOT, "wayward bench: --input %s: too short to measure (the "
                    + "first %.0f s are warm-up; give a recording at least 10 s longer, or a shorter --warm-up)", input,
                    warmup));
            return Main.NO_INPUT;
        }
        out.printf(java.util.Locale.ROOT, "bench: %s%s, %d camera%s, %d cores, %.1f s wall; after the first %.0f s of "
                + "stream (warm-up)%n", input, analysisInput == null ? "" : " (only demuxed), analysis on " + analysisInput,
                n, n == 1 ? "" : "s", Runtime.getRuntime().availableProcessors(), wallSeconds, warmup);
        out.println("camera | frames decoded | analysed | decode ms/frame | luma+downscale ms/analysed | flow ms/analysed"
                + " | zones+rules ms/analysed" + (analysisInput == null ? "" : " | main packets | main demux ms/packet")
                + " | CPU ms per video second | × decode");
        for (var p : s.pipelines()) {
            StageFigures m = p.stageFigures();
            double decoded = Math.max(1, m.decodedFrames());
            double analysed = Math.max(1, m.analysedFrames());
            String main = analysisInput == null ? "" : String.format(java.util.Locale.ROOT, " | %d | %.4f",
                    m.mainPackets(), m.mainDemuxNanos() / 1e6 / Math.max(1, m.mainPackets()));
            out.printf(java.util.Locale.ROOT, "%s | %d | %d | %.3f | %.3f | %.3f | %.3f%s | %.1f | %.2f%n", p.id(),
                    m.decodedFrames(), m.analysedFrames(), m.decodeNanos() / 1e6 / decoded,
                    m.shrinkNanos() / 1e6 / analysed, m.flowNanos() / 1e6 / analysed, m.zonesNanos() / 1e6 / analysed,
                    main,
                    m.nanosPerVideoSecond() / 1e6,
                    m.decodeNanos() == 0 ? Double.NaN : m.nanosPerVideoSecond() * m.streamSeconds() / m.decodeNanos());
        }
        return Main.OK;
    }
}
