package wayward.cli;

import java.io.PrintStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Set;
import wayward.analysis.CameraConfig;
import wayward.config.SiteConfig;
import wayward.secret.Urls;
import wayward.service.Service;

/** Analyses a recorded file as fast as the CPU allows, with one camera's zones; events on stdout. */
final class ReplayCommand extends Command {
    ReplayCommand() {
        super("replay", Set.of("--config", "--input", "--camera", "--report", "--annotate"), String.join("\n",
                "usage: java -jar wayward.jar replay --config FILE --input VIDEO [--camera ID] [--report DIR]",
                "           [--annotate OUT.mp4]",
                "",
                "Runs the same analysis on a recorded file as fast as the CPU allows, with the zones and rules of",
                "one configured camera (--camera, needed when the config has several). Every event phase is printed",
                "as one JSON line on standard output; nothing is sent to webhooks. Progress goes to standard error",
                "when it is a terminal.",
                "",
                "--report DIR writes a tuning report: per zone a CSV of every reading (stream time, moving share,",
                "against share, their speeds and bearings, movers followed, the largest travel against the heading, the",
                "rule's state), for zones with a heading a CSV of every followed mover in every frame, a PNG plot",
                "(shares; for zones with a heading also the travel with min_travel_px and quick_travel_px; events",
                "shaded), events.jsonl, and index.html gathering them. Then try other settings in a fraction of a",
                "second with: wayward what-if --report DIR --min-travel-px 15",
                "",
                "--annotate OUT.mp4 writes the analysis frames with the flow arrows (Baker et al. colour wheel, the",
                "wheel in the corner as legend), zones, headings and each rule's state, as H.264."));
    }

    @Override
    int run(Options o, PrintStream out, PrintStream err) throws Exception {
        SiteConfig c = o.config(null, err);
        String input = o.required("--input", "VIDEO", "", err);
        if (!Urls.isUrl(input) && !Files.isRegularFile(Path.of(input))) {
            err.println("wayward replay: --input " + input + ": file not found");
            return Main.NO_INPUT;
        }
        CameraConfig cam;
        if (o.has("--camera")) {
            cam = c.camera(o.get("--camera"));
            if (cam == null) {
                List<String> ids = new ArrayList<>();
                c.cameras().forEach(k -> ids.add(k.id()));
                err.println("wayward replay: --camera " + o.get("--camera") + ": no such camera (expected one of "
                        + String.join(", ", ids) + ")");
                return Main.USAGE;
            }
        } else if (c.cameras().size() == 1) {
            cam = c.cameras().get(0);
        } else {
            err.println("wayward replay: the config has " + c.cameras().size()
                    + " cameras; say whose zones to use with --camera ID");
            return Main.USAGE;
        }
        String source = Urls.isUrl(input) ? input : Path.of(input).toAbsolutePath().toString();
        CameraConfig replayed = cam.withSource(source, false);
        Service s = new Service(c, List.of(replayed), Service.Mode.REPLAY, out, 0);
        wayward.report.ReplayReport report = null;
        if (o.has("--report")) {
            report = new wayward.report.ReplayReport();
            s.bus().add(report, 100_000);
        }
        wayward.report.Annotator annotator = null;
        if (o.has("--annotate")) {
            Path target = Path.of(o.get("--annotate"));
            if (!target.getFileName().toString().toLowerCase(java.util.Locale.ROOT).endsWith(".mp4")) {
                err.println("wayward replay: --annotate " + target + " (expected a file name ending in .mp4)");
                return Main.USAGE;
            }
            if (target.toAbsolutePath().getParent() != null) {
                Files.createDirectories(target.toAbsolutePath().getParent());
            }
            annotator = new wayward.report.Annotator(target, replayed.analysisFps());
            s.listenFrames(annotator);
        }
        wayward.report.ReplayReport r0 = report;
        wayward.report.Annotator a0 = annotator;
        if (report != null || annotator != null) {
            s.listenReadings((camera, zone, reading, movers, state) -> {
                if (r0 != null) {
                    r0.reading(camera, zone, reading, movers, state);
                }
                if (a0 != null) {
                    a0.reading(camera, zone, reading, movers, state);
                }
            });
        }
        s.start();
        boolean terminal = System.console() != null;
        long started = System.nanoTime();
        while (!s.awaitEnd(1, java.util.concurrent.TimeUnit.SECONDS)) {
            if (terminal) {
                var p = s.pipelines().get(0);
                double secs = (System.nanoTime() - started) / 1e9;
                err.printf(java.util.Locale.ROOT, "\rreplay: %d frames analysed, stream %.1f s, %.0f frames/s   ",
                        p.analysedFrames(), p.streamSeconds(), p.analysedFrames() / Math.max(secs, 1e-3));
            }
        }
        if (terminal) {
            err.println();
        }
        s.stop();
        String failure = s.pipelines().get(0).sourceFailure();
        if (failure != null) {
            err.println("wayward replay: --input " + input + ": cannot read it as video (" + failure + ")");
            return Main.NO_INPUT;
        }
        if (report != null) {
            Path index = report.write(Path.of(o.get("--report")));
            err.println("wayward replay: report written to " + index);
        }
        if (annotator != null) {
            annotator.close();
            err.println("wayward replay: " + annotator.frames() + " annotated frames written to " + o.get("--annotate"));
        }
        return Main.OK;
    }
}
