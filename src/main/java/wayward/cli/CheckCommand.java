package wayward.cli;

import java.io.PrintStream;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Set;
import wayward.analysis.CameraConfig;
import wayward.config.ConfigPrinter;
import wayward.config.SiteConfig;

/**
 * Checks a config and prints the effective one (secrets masked), what learning zones learned, and for zones with
 * hours whether they are in hours now and until when.
 */
final class CheckCommand extends Command {
    CheckCommand() {
        super("check", Set.of("--config"), String.join("\n",
                "usage: java -jar wayward.jar check --config FILE",
                "",
                "Checks the config file and prints the effective config (defaults filled in, secrets masked).",
                "Exit 0 when it is usable; otherwise every mistake on one line each (file:line:column: key: value",
                "(expected ...)) and exit 78 (config errors)."));
    }

    @Override
    int run(Options o, PrintStream out, PrintStream err) throws Exception {
        SiteConfig c = o.config(null, err);
        out.print(ConfigPrinter.toToml(c));
        if (c.shard() != null) {
            List<String> ids = new ArrayList<>();
            c.cameras().forEach(k -> ids.add(k.id()));
            out.println("# instance " + c.shard().instance() + " of " + String.join(", ", c.shard().instances())
                    + " watches: " + String.join(", ", wayward.service.Shards.mine(ids, c.shard().instance(),
                    c.shard().instances())));
            if (c.shard().viaBroker()) {
                out.println("# membership broker: that is while all are online; when one goes offline the others take "
                        + "its cameras, and hand them back when it returns");
            }
        }
        // which stream of a two-stream camera does what
        for (CameraConfig cam : c.cameras()) {
            if (cam.twoStreams()) {
                out.println("# camera " + cam.id() + ": analysis decodes analysis_source; source is only demuxed, for "
                        + "the pre-roll ring and full-size clips (from analysis_source while source is down)");
            }
        }
        // what zones that learn their heading have learned so far (data_dir/learned)
        for (CameraConfig cam : c.cameras()) {
            for (wayward.analysis.ZoneConfig z : cam.zones()) {
                if (!z.learnsHeading()) {
                    continue;
                }
                Path f = wayward.analysis.LearnedHeadings.file(
                        wayward.analysis.LearnedHeadings.folder(c.dataDir(), cam.id()), z.id());
                String learned;
                try {
                    double h = wayward.analysis.LearnedHeadings.read(f);
                    learned = Double.isNaN(h) ? "not learned yet"
                            : "learned heading_deg = " + String.format(java.util.Locale.ROOT, "%.1f", h) + " (" + f + ")";
                } catch (java.io.IOException e) {
                    learned = "cannot read what was learned (" + e.getMessage() + "); it is learned again at start";
                }
                out.println("# camera " + cam.id() + " zone " + z.id() + ": " + learned);
            }
        }
        // each zone with hours: in or off hours now, and when that changes (site time, with its offset)
        java.time.Instant now = java.time.Instant.now();
        for (CameraConfig cam : c.cameras()) {
            for (wayward.analysis.ZoneConfig z : cam.zones()) {
                if (z.hasHours()) {
                    out.println("# camera " + cam.id() + " zone " + z.id() + ": " + z.hours().describe(now));
                }
            }
        }
        return Main.OK;
    }
}
