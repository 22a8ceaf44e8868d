package wayward.scene;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;

/** The generator's MP4 as an outside tool sees it: ffprobe from Debian's ffmpeg package. */
class SceneVideoIT {
    @Test
    @Timeout(value = 120, unit = TimeUnit.SECONDS)
    void renderedSceneIsH264WithTheScriptedFrameCount(@TempDir Path dir) throws Exception {
        Scene scene = Scene.load(Path.of("test-streams/dock-lane.scene.toml"));
        Path video = dir.resolve("dock.mp4");
        new SceneGenerator(scene).write(video, dir.resolve("dock.json"));
        Process p = new ProcessBuilder("ffprobe", "-v", "error", "-select_streams", "v:0", "-count_packets",
                "-show_entries", "stream=codec_name,width,height,nb_read_packets,avg_frame_rate",
                "-of", "default=noprint_wrappers=1", video.toString()).redirectErrorStream(true).start();
        String out = new String(p.getInputStream().readAllBytes(), java.nio.charset.StandardCharsets.UTF_8);
        assertEquals(0, p.waitFor());
        List<String> lines = out.lines().sorted().toList();
        assertEquals(List.of("avg_frame_rate=15/1", "codec_name=h264", "height=360",
                "nb_read_packets=" + Math.round(scene.seconds() * scene.fps()), "width=640"), lines);
        // the first packet is a keyframe (flags start with K), so a clip of it starts cleanly
        Process q = new ProcessBuilder("ffprobe", "-v", "error", "-select_streams", "v:0", "-read_intervals", "%+#1",
                "-show_entries", "packet=flags", "-of", "csv=p=0", video.toString()).redirectErrorStream(true).start();
        String flags = new String(q.getInputStream().readAllBytes(), java.nio.charset.StandardCharsets.UTF_8).trim();
        assertEquals(0, q.waitFor());
        assertEquals('K', flags.charAt(0), flags);
    }
}
