package wayward.cli;

import java.io.PrintStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Set;
import wayward.scene.Scene;
import wayward.scene.SceneGenerator;

/** Renders a test scene video with exact ground truth. */
final class MakeSceneCommand extends Command {
    MakeSceneCommand() {
        super("make-scene", Set.of("--scene", "--video", "--truth"), String.join("\n",
                "usage: java -jar wayward.jar make-scene --scene FILE.scene.toml --video OUT.mp4 --truth OUT.json",
                "",
                "Renders a scenario video with exact ground truth (see test-streams/README.md)."));
    }

    @Override
    int run(Options o, PrintStream out, PrintStream err) throws Exception {
        for (String k : List.of("--scene", "--video", "--truth")) {
            if (!o.has(k)) {
                err.println("wayward make-scene: " + k + " is required");
                return Main.USAGE;
            }
        }
        Path scene = Path.of(o.get("--scene"));
        if (!Files.isRegularFile(scene)) {
            err.println("wayward make-scene: --scene " + scene + ": file not found");
            return Main.NO_INPUT;
        }
        new SceneGenerator(Scene.load(scene)).write(Path.of(o.get("--video")), Path.of(o.get("--truth")));
        out.println("wrote " + o.get("--video") + " and " + o.get("--truth"));
        return Main.OK;
    }
}
