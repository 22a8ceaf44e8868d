package wayward.cli;

import java.io.PrintStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import wayward.config.CameraConfig;
import wayward.config.ConfigException;
import wayward.config.ConfigLoader;
import wayward.config.ConfigPrinter;
import wayward.config.SiteConfig;
import wayward.scene.Scene;
import wayward.scene.SceneGenerator;
import wayward.service.Service;

/**
 * The {@code wayward} command line. {@link #main} is the only caller of System.exit; {@link #execute} runs a
 * command and returns its exit code (tests call it directly).
 */
public final class Main {
    public static final int OK = 0;
    public static final int FAILED = 1;
    /** Wrong command line (common practice for usage errors). */
    public static final int USAGE = 2;
    /** EX_NOINPUT of BSD sysexits.h: an input file is missing or unreadable. */
    public static final int NO_INPUT = 66;
    /** EX_CONFIG of BSD sysexits.h: the configuration is wrong. */
    public static final int CONFIG = 78;

    private static final String HELP = String.join("\n",
            "wayward: raises an alert when something moves the wrong way inside a marked zone of a camera picture.",
            "",
            "usage: java -jar wayward.jar COMMAND [options]",
            "",
            "commands:",
            "  run     --config FILE                     run the service on the configured cameras",
            "  check   --config FILE                     check a config; print the effective config (secrets masked)",
            "  replay  --config FILE --input VIDEO [--camera ID] [--report DIR] [--annotate OUT.mp4]",
            "                                            analyse a recorded file as fast as possible; events on stdout",
            "  what-if --report DIR [--min-travel-px P] [--hold-seconds S] [--onset-level X] ...",
            "                                            re-run only the rules of a replay report with other settings",
            "  demo    [--config FILE] [--loops N]       run on the bundled demo scene (conf/demo.toml), looped",
            "  bench   --input VIDEO [--cameras N] [--config FILE]",
            "                                            CPU cost per camera and stage, to size a server",
            "  flow    --input A --input B --output OUT.flo [--picture OUT.png]",
            "          --input VIDEO --at SECONDS --output OUT.flo [--picture OUT.png]",
            "                                            optical flow between two pictures (Middlebury .flo + colour wheel PNG)",
            "  help                                      this text; COMMAND --help for one command",
            "",
            "exit codes: 0 done, 1 failed, 2 bad command line, 66 input missing, 78 config errors");

    private static final Map<String, String> COMMAND_HELP = new LinkedHashMap<>();

    static {
        COMMAND_HELP.put("run", String.join("\n",
                "usage: java -jar wayward.jar run --config FILE",
                "",
                "Runs the service: reads every configured camera, analyses motion in its zones and sends each event",
                "phase to the event log (DATA_DIR/events.jsonl) and the configured webhooks. File sources play at",
                "their own speed, like a camera. Stops on SIGTERM or Ctrl-C, or when every file camera has ended.",
                "Logs go to standard error."));
        COMMAND_HELP.put("check", String.join("\n",
                "usage: java -jar wayward.jar check --config FILE",
                "",
                "Checks the config file and prints the effective config (defaults filled in, secrets masked).",
                "Exit 0 when it is usable; otherwise every mistake on one line each (file:line:column: key: value",
                "(expected ...)) and exit 78."));
        COMMAND_HELP.put("replay", String.join("\n",
                "usage: java -jar wayward.jar replay --config FILE --input VIDEO [--camera ID] [--report DIR]",
                "           [--annotate OUT.mp4]",
                "",
                "Runs the same analysis on a recorded file as fast as the CPU allows, with the zones and rules of",
                "one configured camera (--camera, needed when the config has several). Every event phase is printed",
                "as one JSON line on standard output; nothing is sent to webhooks. Progress goes to standard error",
                "when it is a terminal.",
                "",
                "--report DIR writes a tuning report: per zone a CSV of every reading (stream time, coverage, share",
                "moving against, speeds, headings, movers followed, the largest travel against the heading, the",
                "rule's state), for zones with a heading a CSV of every followed mover in every frame, a PNG plot",
                "(shares; for zones with a heading also the travel with min_travel_px and quick_travel_px; events",
                "shaded), events.jsonl, and index.html gathering them. Then try other settings in a fraction of a",
                "second with: wayward what-if --report DIR --min-travel-px 15",
                "",
                "--annotate OUT.mp4 writes the analysis frames with the flow arrows (Baker et al. colour wheel, the",
                "wheel in the corner as legend), zones, headings and each rule's state, as H.264."));
        COMMAND_HELP.put("what-if", String.join("\n",
                "usage: java -jar wayward.jar what-if --report DIR [--hold-seconds S] [--clear-seconds S]",
                "           [--rest-seconds S] [--min-travel-px P] [--quick-travel-px P] [--min-mover-area-px A]",
                "           [--onset-level X] [--release-level X]",
                "",
                "Re-runs only the zone rules on what a 'replay --report' saved, with the given settings in place of",
                "the saved ones, and prints the event phases as JSON lines, as a full replay with those settings",
                "would. Zones with a heading re-run the mover rule on the saved movers (the tracker does not depend",
                "on the rule's settings); zones without re-run the share rule (onset and release levels) on the",
                "saved readings. A setting no zone of the report takes is an error. Then a summary line on standard",
                "error."));
        COMMAND_HELP.put("demo", String.join("\n",
                "usage: java -jar wayward.jar demo [--config FILE] [--loops N]",
                "",
                "Runs the service on the bundled demo scene (a one-way lane in a fictional yard) played as a looping",
                "camera, with conf/demo.toml. Prints every event phase as a JSON line and writes the event log",
                "under the config's data folder. Runs until Ctrl-C, or for N passes over the scene with --loops."));
        COMMAND_HELP.put("bench", String.join("\n",
                "usage: java -jar wayward.jar bench --input VIDEO [--cameras N] [--config FILE]",
                "",
                "Runs N cameras (default 1) on the same file at full speed, every frame decoded and analysed at the",
                "analysis rate, and prints per camera the CPU time of each stage (decode; luma and downscale; flow;",
                "zones and rules), the CPU a second of video costs, and its ratio to the decode stage (which skips",
                "H.264's deblocking filter; `ffmpeg -threads 1 -benchmark -i VIDEO -f null -` shows a full decode).",
                "The first 5 s of stream are JIT warm-up and not counted. With --config, the first camera's zones",
                "and settings are used; without, one zone over the middle of the picture with the default",
                "settings. CPU times are the threads' own (ThreadMXBean)."));
        COMMAND_HELP.put("flow", String.join("\n",
                "usage: java -jar wayward.jar flow --input A.png --input B.png --output OUT.flo [--picture OUT.png]",
                "       java -jar wayward.jar flow --input VIDEO --at SECONDS --output OUT.flo [--picture OUT.png]",
                "",
                "Estimates the optical flow from picture A to picture B (or from the video frame at SECONDS to the next",
                "one) at their own resolution, with the service's estimator and default settings. Writes it as a",
                "Middlebury .flo file (Baker et al. 2011) and as a PNG in their colour wheel, with the wheel as legend",
                "(default: OUT.png beside OUT.flo). Prints the speed of the legend's rim in pixels per frame."));
        COMMAND_HELP.put("make-scene", String.join("\n",
                "usage: java -jar wayward.jar make-scene --scene FILE.scene.toml --video OUT.mp4 --truth OUT.json",
                "",
                "Renders a scenario video with exact ground truth (see test-streams/README.md)."));
    }

    private Main() {
    }

    /** Ends a command early with an exit code; the message has already been printed. */
    private static final class Exit extends Exception {
        private static final long serialVersionUID = 1L;
        final int code;

        Exit(int code) {
            super(null, null, false, false);
            this.code = code;
        }
    }

    public static void main(String[] args) {
        // exit explicitly: library threads (Netty, FFmpeg) must not keep a finished command alive
        System.exit(execute(args, System.out, System.err));
    }

    /** Runs one command; returns its exit code. Never calls System.exit. */
    public static int execute(String[] args, PrintStream out, PrintStream err) {
        if (args.length == 0) {
            err.println(HELP);
            return USAGE;
        }
        String command = args[0];
        if (command.equals("help") || command.equals("--help") || command.equals("-h")) {
            out.println(HELP);
            return OK;
        }
        if (!COMMAND_HELP.containsKey(command)) {
            err.println("wayward: unknown command '" + command + "' (expected run, check, replay, what-if, demo, bench, flow or help)");
            return USAGE;
        }
        Map<String, String> opts = new LinkedHashMap<>();
        Set<String> allowed = switch (command) {
            case "run", "check" -> Set.of("--config");
            case "replay" -> Set.of("--config", "--input", "--camera", "--report", "--annotate");
            case "what-if" -> Set.of("--report", "--onset-level", "--release-level", "--hold-seconds",
                    "--clear-seconds", "--rest-seconds", "--min-travel-px", "--quick-travel-px", "--min-mover-area-px");
            case "demo" -> Set.of("--config", "--loops");
            case "bench" -> Set.of("--input", "--cameras", "--config");
            case "flow" -> Set.of("--input", "--at", "--output", "--picture");
            default -> Set.of("--scene", "--video", "--truth");
        };
        for (int i = 1; i < args.length; i++) {
            String a = args[i];
            if (a.equals("--help") || a.equals("-h")) {
                out.println(COMMAND_HELP.get(command));
                return OK;
            }
            if (!allowed.contains(a)) {
                err.println("wayward " + command + ": unknown option '" + a + "' (expected " + String.join(", ",
                        new java.util.TreeSet<>(allowed)) + ")");
                return USAGE;
            }
            if (i + 1 >= args.length) {
                err.println("wayward " + command + ": option " + a + " needs a value");
                return USAGE;
            }
            String value = args[++i];
            if (a.equals("--input") && opts.containsKey("--input")) {
                opts.put("--input2", value);
            } else {
                opts.put(a, value);
            }
        }
        try {
            return switch (command) {
                case "check" -> check(opts, out, err);
                case "run" -> run(opts, err);
                case "replay" -> replay(opts, out, err);
                case "what-if" -> whatIf(opts, out, err);
                case "demo" -> demo(opts, out, err);
                case "bench" -> bench(opts, out, err);
                case "flow" -> flow(opts, out, err);
                default -> makeScene(opts, out, err);
            };
        } catch (Exit e) {
            return e.code;
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            err.println("wayward " + command + ": interrupted");
            return FAILED;
        } catch (Exception e) {
            err.println("wayward " + command + ": " + e);
            return FAILED;
        }
    }

    /** Loads the config named by --config (or the fallback); prints the errors and exits 78 if it is wrong. */
    private static SiteConfig loadConfig(String command, Map<String, String> opts, String fallback,
            PrintStream err) throws Exit {
        String file = opts.getOrDefault("--config", fallback);
        if (file == null) {
            err.println("wayward " + command + ": --config FILE is required");
            throw new Exit(USAGE);
        }
        try {
            return ConfigLoader.load(Path.of(file));
        } catch (ConfigException e) {
            for (String line : e.errors()) {
                err.println(line);
            }
            err.println(e.errors().size() == 1 ? "1 error; nothing started"
                    : e.errors().size() + " errors; nothing started");
            throw new Exit(CONFIG);
        }
    }

    private static int check(Map<String, String> opts, PrintStream out, PrintStream err) throws Exit {
        SiteConfig c = loadConfig("check", opts, null, err);
        out.print(ConfigPrinter.toToml(c));
        if (c.shard() != null) {
            List<String> ids = new ArrayList<>();
            c.cameras().forEach(k -> ids.add(k.id()));
            out.println("# instance " + c.shard().instance() + " of " + String.join(", ", c.shard().instances())
                    + " watches: " + String.join(", ", wayward.service.Shards.mine(ids, c.shard().instance(),
                    c.shard().instances())));
        }
        // what zones that learn their heading have learned so far (data_dir/learned)
        for (CameraConfig cam : c.cameras()) {
            for (wayward.config.ZoneConfig z : cam.zones()) {
                if (!z.learnsHeading()) {
                    continue;
                }
                Path f = wayward.service.LearnedHeadings.file(
                        wayward.service.LearnedHeadings.folder(c.dataDir(), cam.id()), z.id());
                String learned;
                try {
                    double h = wayward.service.LearnedHeadings.read(f);
                    learned = Double.isNaN(h) ? "not learned yet"
                            : "learned heading_deg = " + String.format(java.util.Locale.ROOT, "%.1f", h) + " (" + f + ")";
                } catch (java.io.IOException e) {
                    learned = "cannot read what was learned (" + e.getMessage() + "); it is learned again at start";
                }
                out.println("# camera " + cam.id() + " zone " + z.id() + ": " + learned);
            }
        }
        return OK;
    }

    private static int run(Map<String, String> opts, PrintStream err) throws Exception {
        SiteConfig c = loadConfig("run", opts, null, err);
        Service s = new Service(c, c.cameras(), Service.Mode.RUN, System.out, 0);
        return serve(s, Path.of(opts.get("--config")));
    }

    private static void reload(Service s, Path file, wayward.service.SystemdNotify notify) {
        if (notify != null) {
            notify.send("RELOADING=1");
        }
        try {
            reload(s, file);
        } finally {
            if (notify != null) {
                notify.send("READY=1\nSTATUS=watching " + s.pipelines().size() + " cameras");
            }
        }
    }

    private static void reload(Service s, Path file) {
        org.slf4j.Logger log = org.slf4j.LoggerFactory.getLogger(Main.class);
        log.info("reload: reading {}", file);
        SiteConfig next;
        try {
            next = wayward.config.ConfigLoader.load(file);
        } catch (ConfigException e) {
            for (String line : e.errors()) {
                log.error("reload: {}", line);
            }
            log.error("reload refused ({} {}); the running config stays", e.errors().size(),
                    e.errors().size() == 1 ? "mistake" : "mistakes");
            return;
        }
        s.reload(next);
    }

    private static int demo(Map<String, String> opts, PrintStream out, PrintStream err) throws Exception {
        int loops = 0;
        if (opts.containsKey("--loops")) {
            try {
                loops = Integer.parseInt(opts.get("--loops"));
            } catch (NumberFormatException e) {
                loops = -1;
            }
            if (loops < 1) {
                err.println("wayward demo: --loops " + opts.get("--loops") + " (expected a whole number of 1 or more)");
                return USAGE;
            }
        }
        String fallback = "conf/demo.toml";
        if (!opts.containsKey("--config") && !Files.isRegularFile(Path.of(fallback))) {
            err.println("wayward demo: " + fallback + " not found; run from the project folder or pass --config FILE");
            return NO_INPUT;
        }
        SiteConfig c = loadConfig("demo", opts, fallback, err);
        List<CameraConfig> looped = new ArrayList<>();
        for (CameraConfig cam : c.cameras()) {
            looped.add(cam.withSource(cam.source(), !cam.isUrl()));
        }
        err.println("wayward demo: playing the demo scene as a camera; events follow as JSON lines"
                + (loops == 0 ? " (Ctrl-C to stop)" : ""));
        return serve(new Service(c, looped, Service.Mode.DEMO, out, loops), null);
    }

    /** Runs the service until its cameras end or a signal stops it; {@code reloadFrom}: SIGHUP re-reads it. */
    private static int serve(Service s, Path reloadFrom) throws Exception {
        wayward.http.StatusServer[] server = new wayward.http.StatusServer[1];
        wayward.service.SystemdNotify[] notify = new wayward.service.SystemdNotify[1];
        java.util.concurrent.atomic.AtomicBoolean stopping = new java.util.concurrent.atomic.AtomicBoolean();
        Runnable stopAll = () -> {
            if (notify[0] != null && stopping.compareAndSet(false, true)) {
                notify[0].send("STOPPING=1");
            }
            s.stop();
            synchronized (server) {
                if (server[0] != null) {
                    server[0].close(); // last, so health and metrics answer while the rest shuts down
                    server[0] = null;
                }
            }
        };
        Thread hook = new Thread(stopAll, "shutdown");
        Runtime.getRuntime().addShutdownHook(hook);
        s.start();
        if (s.config().http() != null) {
            try {
                synchronized (server) {
                    server[0] = wayward.http.StatusServer.start(s.config().http(), s);
                }
            } catch (java.io.IOException e) {
                org.slf4j.LoggerFactory.getLogger(Main.class).error("status server: {}", e.getMessage());
            }
        }
        notify[0] = wayward.service.SystemdNotify.fromEnvironment(s);
        if (reloadFrom != null) {
            // SIGHUP (systemctl reload): read the file again; a bad file is refused and the running config stays
            sun.misc.Signal.handle(new sun.misc.Signal("HUP"), sig -> {
                Thread t = new Thread(() -> reload(s, reloadFrom, notify[0]), "reload");
                t.setDaemon(true);
                t.start();
            });
        }
        if (notify[0] != null) {
            notify[0].send("READY=1\nSTATUS=watching " + s.pipelines().size() + " cameras\nMAINPID="
                    + ProcessHandle.current().pid());
        }
        s.awaitEnd();
        stopAll.run();
        if (notify[0] != null) {
            notify[0].close();
        }
        try {
            Runtime.getRuntime().removeShutdownHook(hook);
        } catch (IllegalStateException shuttingDown) {
            // the hook is already running
        }
        return OK;
    }

    private static int replay(Map<String, String> opts, PrintStream out, PrintStream err) throws Exception {
        SiteConfig c = loadConfig("replay", opts, null, err);
        String input = opts.get("--input");
        if (input == null) {
            err.println("wayward replay: --input VIDEO is required");
            return USAGE;
        }
        if (!CameraConfig.isUrl(input) && !Files.isRegularFile(Path.of(input))) {
            err.println("wayward replay: --input " + input + ": file not found");
            return NO_INPUT;
        }
        CameraConfig cam;
        if (opts.containsKey("--camera")) {
            cam = c.camera(opts.get("--camera"));
            if (cam == null) {
                List<String> ids = new ArrayList<>();
                c.cameras().forEach(k -> ids.add(k.id()));
                err.println("wayward replay: --camera " + opts.get("--camera") + ": no such camera (expected one of "
                        + String.join(", ", ids) + ")");
                return USAGE;
            }
        } else if (c.cameras().size() == 1) {
            cam = c.cameras().get(0);
        } else {
            err.println("wayward replay: the config has " + c.cameras().size()
                    + " cameras; say whose zones to use with --camera ID");
            return USAGE;
        }
        String source = CameraConfig.isUrl(input) ? input : Path.of(input).toAbsolutePath().toString();
        CameraConfig replayed = cam.withSource(source, false);
        Service s = new Service(c, List.of(replayed), Service.Mode.REPLAY, out, 0);
        wayward.report.ReplayReport report = null;
        if (opts.containsKey("--report")) {
            report = new wayward.report.ReplayReport();
            s.bus().add(report, 100_000);
        }
        wayward.report.Annotator annotator = null;
        if (opts.containsKey("--annotate")) {
            Path target = Path.of(opts.get("--annotate"));
            if (!target.getFileName().toString().toLowerCase(java.util.Locale.ROOT).endsWith(".mp4")) {
                err.println("wayward replay: --annotate " + target + " (expected a file name ending in .mp4)");
                return USAGE;
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
            return NO_INPUT;
        }
        if (report != null) {
            Path index = report.write(Path.of(opts.get("--report")));
            err.println("wayward replay: report written to " + index);
        }
        if (annotator != null) {
            annotator.close();
            err.println("wayward replay: " + annotator.frames() + " annotated frames written to " + opts.get("--annotate"));
        }
        return OK;
    }

    private static int bench(Map<String, String> opts, PrintStream out, PrintStream err) throws Exception {
        String input = opts.get("--input");
        if (input == null) {
            err.println("wayward bench: --input VIDEO is required");
            return USAGE;
        }
        if (!Files.isRegularFile(Path.of(input))) {
            err.println("wayward bench: --input " + input + ": file not found");
            return NO_INPUT;
        }
        int n = 1;
        if (opts.containsKey("--cameras")) {
            try {
                n = Integer.parseInt(opts.get("--cameras"));
            } catch (NumberFormatException e) {
                n = 0;
            }
            if (n < 1 || n > 64) {
                err.println("wayward bench: --cameras " + opts.get("--cameras") + " (expected a whole number from 1 to 64)");
                return USAGE;
            }
        }
        SiteConfig c;
        String video = Path.of(input).toAbsolutePath().toString();
        if (opts.containsKey("--config")) {
            c = loadConfig("bench", opts, null, err);
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
            CameraConfig copy = first.withSource(video, false);
            copies.add(new CameraConfig(first.id() + "-" + i, copy.source(), false, copy.analysisWidth(),
                    copy.analysisFps(), copy.removeCameraMotion(), copy.input(), copy.zones(), copy.tamperAlerts()));
        }
        Service s = new Service(c, copies, Service.Mode.REPLAY, new PrintStream(java.io.OutputStream.nullOutputStream()), 0);
        // the first seconds of stream are JIT warm-up: each camera counts only from there on
        double warmup = 5;
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
        if (s.pipelines().stream().anyMatch(p -> p.stageFigures()[5] == 0)) {
            err.println("wayward bench: --input " + input + ": too short to measure (the first " + (int) warmup
                    + " s are warm-up; give a recording of at least 15 s)");
            return NO_INPUT;
        }
        out.printf(java.util.Locale.ROOT, "bench: %s, %d camera%s, %d cores, %.1f s wall; after the first %.0f s of "
                + "stream (warm-up)%n", input, n, n == 1 ? "" : "s", Runtime.getRuntime().availableProcessors(),
                wallSeconds, warmup);
        out.println("camera | frames decoded | analysed | decode ms/frame | luma+downscale ms/analysed | flow ms/analysed"
                + " | zones+rules ms/analysed | CPU ms per video second | × decode");
        for (var p : s.pipelines()) {
            double[] m = p.stageFigures();
            double decoded = Math.max(1, m[4]);
            double analysed = Math.max(1, m[5]);
            double total = (m[0] + m[1] + m[2] + m[3]) / 1e6;
            out.printf(java.util.Locale.ROOT, "%s | %d | %d | %.3f | %.3f | %.3f | %.3f | %.1f | %.2f%n", p.id(),
                    (long) m[4], (long) m[5], m[0] / 1e6 / decoded, m[1] / 1e6 / analysed, m[2] / 1e6 / analysed,
                    m[3] / 1e6 / analysed, total / Math.max(1e-3, m[6]),
                    m[0] == 0 ? Double.NaN : (m[0] + m[1] + m[2] + m[3]) / m[0]);
        }
        return OK;
    }

    private static int whatIf(Map<String, String> opts, PrintStream out, PrintStream err) throws Exception {
        String dir = opts.get("--report");
        if (dir == null) {
            err.println("wayward what-if: --report DIR is required (a folder written by replay --report)");
            return USAGE;
        }
        if (!Files.isDirectory(Path.of(dir)) || wayward.report.WhatIf.series(Path.of(dir)).isEmpty()) {
            err.println("wayward what-if: --report " + dir + ": no replay report there (expected the .csv series "
                    + "that replay --report writes)");
            return NO_INPUT;
        }
        Map<String, Double> overrides = new LinkedHashMap<>();
        for (Map.Entry<String, String> o : opts.entrySet()) {
            if (o.getKey().equals("--report")) {
                continue;
            }
            String key = o.getKey().substring(2).replace('-', '_');
            try {
                double v = Double.parseDouble(o.getValue());
                if (!(v >= 0) || (key.endsWith("_level") && v > 1)) {
                    throw new NumberFormatException();
                }
                overrides.put(key, v);
            } catch (NumberFormatException e) {
                err.println("wayward what-if: " + o.getKey() + " " + o.getValue() + " (expected a number of 0 or more"
                        + (key.endsWith("_level") ? ", at most 1" : "") + ")");
                return USAGE;
            }
        }
        long began = System.nanoTime();
        List<wayward.event.Event> events;
        try {
            events = wayward.report.WhatIf.run(Path.of(dir), overrides);
        } catch (IllegalArgumentException e) {
            err.println("wayward what-if: " + e.getMessage());
            return USAGE;
        }
        wayward.report.WhatIf.print(events, out);
        long starts = events.stream().filter(e -> e.phase() == wayward.event.Event.Phase.START).count();
        err.printf(java.util.Locale.ROOT, "wayward what-if: %d events with %s (%.0f ms)%n", starts,
                overrides.isEmpty() ? "the saved settings" : overrides, (System.nanoTime() - began) / 1e6);
        return OK;
    }

    private static int flow(Map<String, String> opts, PrintStream out, PrintStream err) throws Exception {
        String first = opts.get("--input");
        String second = opts.get("--input2");
        String output = opts.get("--output");
        if (first == null || output == null || (second == null) == (opts.get("--at") == null)) {
            err.println("wayward flow: give --input A --input B, or --input VIDEO --at SECONDS, and --output OUT.flo");
            return USAGE;
        }
        for (String f : second == null ? List.of(first) : List.of(first, second)) {
            if (!Files.isRegularFile(Path.of(f))) {
                err.println("wayward flow: --input " + f + ": file not found");
                return NO_INPUT;
            }
        }
        wayward.picture.FlowTool.Gray[] pair;
        try {
            if (second != null) {
                pair = new wayward.picture.FlowTool.Gray[] {wayward.picture.FlowTool.readPicture(Path.of(first)),
                    wayward.picture.FlowTool.readPicture(Path.of(second))};
            } else {
                double at;
                try {
                    at = Double.parseDouble(opts.get("--at"));
                } catch (NumberFormatException e) {
                    at = -1;
                }
                if (!(at >= 0)) {
                    err.println("wayward flow: --at " + opts.get("--at") + " (expected seconds, 0 or more)");
                    return USAGE;
                }
                pair = wayward.picture.FlowTool.readVideoPair(Path.of(first), at);
            }
        } catch (java.io.IOException e) {
            err.println("wayward flow: " + e.getMessage());
            return NO_INPUT;
        }
        Path flo = Path.of(output);
        Path png = Path.of(opts.getOrDefault("--picture", output.replaceAll("\\.flo$", "") + ".png"));
        wayward.flow.FlowField f;
        try {
            f = wayward.picture.FlowTool.estimate(pair[0], pair[1]);
        } catch (IllegalArgumentException e) {
            err.println("wayward flow: " + e.getMessage());
            return USAGE;
        }
        double rim = wayward.picture.FlowTool.write(f, flo, png);
        out.printf(java.util.Locale.ROOT, "wrote %s and %s (%dx%d; legend rim = %.2f px per frame)%n", flo, png,
                f.width, f.height, rim);
        return OK;
    }

    private static int makeScene(Map<String, String> opts, PrintStream out, PrintStream err) throws Exception {
        for (String k : List.of("--scene", "--video", "--truth")) {
            if (!opts.containsKey(k)) {
                err.println("wayward make-scene: " + k + " is required");
                return USAGE;
            }
        }
        Path scene = Path.of(opts.get("--scene"));
        if (!Files.isRegularFile(scene)) {
            err.println("wayward make-scene: --scene " + scene + ": file not found");
            return NO_INPUT;
        }
        new SceneGenerator(Scene.load(scene)).write(Path.of(opts.get("--video")), Path.of(opts.get("--truth")));
        out.println("wrote " + opts.get("--video") + " and " + opts.get("--truth"));
        return OK;
    }
}
