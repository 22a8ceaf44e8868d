package wayward.cli;

import java.io.PrintStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Set;

/** Optical flow between two pictures, or a video frame and the next, as .flo and colour-wheel PNG. */
final class FlowCommand extends Command {
    FlowCommand() {
        super("flow", Set.of("--input", "--at", "--output", "--picture"), String.join("\n",
                "usage: java -jar wayward.jar flow --input A.png --input B.png --output OUT.flo [--picture OUT.png]",
                "       java -jar wayward.jar flow --input VIDEO --at SECONDS --output OUT.flo [--picture OUT.png]",
                "",
                "Estimates the optical flow from picture A to picture B (or from the video frame at SECONDS to the next",
                "one) at their own resolution, with the service's estimator and default settings. Writes it as a",
                "Middlebury .flo file (Baker et al. 2011) and as a PNG in their colour wheel, with the wheel as legend",
                "(default: OUT.png beside OUT.flo). Prints the speed of the legend's rim in pixels per frame."));
    }

    @Override
    int run(Options o, PrintStream out, PrintStream err) throws Exception {
        String first = o.get("--input");
        String second = o.get("--input2");
        String output = o.get("--output");
        if (first == null || output == null || (second == null) == (o.get("--at") == null)) {
            err.println("wayward flow: give --input A --input B, or --input VIDEO --at SECONDS, and --output OUT.flo");
            return Main.USAGE;
        }
        for (String f : second == null ? List.of(first) : List.of(first, second)) {
            if (!Files.isRegularFile(Path.of(f))) {
                err.println("wayward flow: --input " + f + ": file not found");
                return Main.NO_INPUT;
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
                    at = Double.parseDouble(o.get("--at"));
                } catch (NumberFormatException e) {
                    at = -1;
                }
                if (!(at >= 0)) {
                    err.println("wayward flow: --at " + o.get("--at") + " (expected seconds, 0 or more)");
                    return Main.USAGE;
                }
                pair = wayward.picture.FlowTool.readVideoPair(Path.of(first), at);
            }
        } catch (java.io.IOException e) {
            err.println("wayward flow: " + e.getMessage());
            return Main.NO_INPUT;
        }
        Path flo = Path.of(output);
        Path png = Path.of(o.getOrDefault("--picture", output.replaceAll("\\.flo$", "") + ".png"));
        wayward.flow.FlowField f;
        try {
            f = wayward.picture.FlowTool.estimate(pair[0], pair[1]);
        } catch (IllegalArgumentException e) {
            err.println("wayward flow: " + e.getMessage());
            return Main.USAGE;
        }
        double rim = wayward.picture.FlowTool.write(f, flo, png);
        out.printf(java.util.Locale.ROOT, "wrote %s and %s (%dx%d; legend rim = %.2f px per frame)%n", flo, png,
                f.width, f.height, rim);
        return Main.OK;
    }
}
