package wayward.cli;

import java.io.PrintStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Set;
import wayward.analysis.CameraConfig;
import wayward.config.SiteConfig;
import wayward.http.StatusServer;
import wayward.service.Lifecycle;
import wayward.service.Service;

/** Runs the service on the bundled demo scene, looped. */
final class DemoCommand extends Command {
    DemoCommand() {
        super("demo", Set.of("--config", "--loops"), String.join("\n",
                "usage: java -jar wayward.jar demo [--config FILE] [--loops N]",
                "",
                "Runs the service on the bundled demo scene (a one-way lane in a fictional yard) played as a looping",
                "camera, with conf/demo.toml. Prints every event phase as a JSON line and writes the event log",
                "under the config's data folder. Runs until Ctrl-C, or for N passes over the scene with --loops."));
    }

    @Override
    int run(Options o, PrintStream out, PrintStream err) throws Exception {
        int loops = 0;
        if (o.has("--loops")) {
            try {
                loops = Integer.parseInt(o.get("--loops"));
            } catch (NumberFormatException e) {
                loops = -1;
            }
            if (loops < 1) {
                err.println("wayward demo: --loops " + o.get("--loops") + " (expected a whole number of 1 or more)");
                return Main.USAGE;
            }
        }
        String fallback = "conf/demo.toml";
        if (!o.has("--config") && !Files.isRegularFile(Path.of(fallback))) {
            err.println("wayward demo: " + fallback + " not found; run from the project folder or pass --config FILE");
            return Main.NO_INPUT;
        }
        SiteConfig c = o.config(fallback, err);
        List<CameraConfig> looped = new ArrayList<>();
        for (CameraConfig cam : c.cameras()) {
            looped.add(cam.withSources(cam.source(), cam.analysisSource(), !cam.isUrl()));
        }
        err.println("wayward demo: playing the demo scene as a camera; events follow as JSON lines"
                + (loops == 0 ? " (Ctrl-C to stop)" : ""));
        Lifecycle.serve(new Service(c, looped, Service.Mode.DEMO, out, loops), null, StatusServer::start);
        return Main.OK;
    }
}
