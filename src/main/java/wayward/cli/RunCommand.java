package wayward.cli;

import java.io.PrintStream;
import java.nio.file.Path;
import java.util.Set;
import wayward.config.SiteConfig;
import wayward.http.StatusServer;
import wayward.service.Lifecycle;
import wayward.service.Service;

/** Runs the service on the configured cameras until a signal stops it. */
final class RunCommand extends Command {
    RunCommand() {
        super("run", Set.of("--config"), String.join("\n",
                "usage: java -jar wayward.jar run --config FILE",
                "",
                "Runs the service: reads every configured camera, analyses motion in its zones and sends each event",
                "phase to the event log (DATA_DIR/events.jsonl), the configured webhooks and the MQTT broker",
                "([mqtt]; also each camera's and zone's state, retained). File sources play at their own speed,",
                "like a camera. Stops on SIGTERM or Ctrl-C, or when every file camera has ended. Logs go to",
                "standard error. Exit 78 (config errors) when the config is wrong."));
    }

    @Override
    int run(Options o, PrintStream out, PrintStream err) throws Exception {
        SiteConfig c = o.config(null, err);
        Service s = new Service(c, c.cameras(), Service.Mode.RUN, System.out, 0);
        Lifecycle.serve(s, Path.of(o.get("--config")), StatusServer::start);
        return Main.OK;
    }
}
