package wayward.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.awt.image.BufferedImage;
import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.TimeUnit;
import javax.imageio.ImageIO;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;
import wayward.cli.Main;

/**
 * {@code replay --annotate} on the demo scene, checked with ffprobe and ffmpeg (Debian): an H.264 MP4 with one
 * frame per analysed frame over the clip's 26 s, and during the truck's event the drawn state and the flow
 * arrows are there (pixel counts of a frame ffmpeg decoded).
 */
class AnnotateIT {
    private static String run(String... cmd) throws Exception {
        Process p = new ProcessBuilder(cmd).redirectErrorStream(true).start();
        String out = new String(p.getInputStream().readAllBytes(), StandardCharsets.UTF_8).trim();
        assertEquals(0, p.waitFor(), String.join(" ", cmd) + "\n" + out);
        return out;
    }

    @Test
    @Timeout(value = 120, unit = TimeUnit.SECONDS)
    void annotatedVideoHasEveryAnalysedFrameAndShowsTheEvent(@TempDir Path dir) throws Exception {
        Path mp4 = dir.resolve("annotated.mp4");
        ByteArrayOutputStream err = new ByteArrayOutputStream();
        int rc = Main.execute(new String[] {"replay", "--config", "conf/demo.toml", "--input",
            "test-streams/yard-lane.mp4", "--annotate", mp4.toString()}, new PrintStream(new ByteArrayOutputStream()),
                new PrintStream(err, true, StandardCharsets.UTF_8));
        assertEquals(0, rc, err.toString(StandardCharsets.UTF_8));
        String written = err.toString(StandardCharsets.UTF_8);
        int frames = Integer.parseInt(written.replaceAll("(?s).*replay: (\\d+) annotated frames.*", "$1"));
        assertEquals(List.of("h264", "640", "360", Integer.toString(frames)), List.of(run("ffprobe", "-v", "error",
                "-select_streams", "v:0", "-count_packets", "-show_entries", "stream=codec_name,width,height,nb_read_packets",
                "-of", "csv=p=0", mp4.toString()).split(",")));
        assertEquals(26.0, Double.parseDouble(run("ffprobe", "-v", "error", "-show_entries", "format=duration", "-of",
                "csv=p=0", mp4.toString())), 0.3, "the clip's 26 s, at the frames' stream times");
        assertTrue(frames >= 250, "10 analysed frames a second: " + frames);
        Path png = dir.resolve("at-13.5s.png");
        run("ffmpeg", "-v", "error", "-ss", "13.5", "-i", mp4.toString(), "-frames:v", "1", "-y", png.toString());
        BufferedImage img = ImageIO.read(png.toFile());
        int red = 0;
        int yellow = 0;
        for (int y = 0; y < img.getHeight(); y++) {
            for (int x = 0; x < img.getWidth(); x++) {
                int rgb = img.getRGB(x, y);
                int r = (rgb >> 16) & 0xff;
                int g = (rgb >> 8) & 0xff;
                int b = rgb & 0xff;
                if (y < 30 && x < 200 && r > 200 && g < 110 && b < 110) {
                    red++; // "lane-2-out: active" in red
                }
                if (r > 180 && g > 180 && b < 100) {
                    yellow++; // downward arrows: yellow in the Baker et al. wheel
                }
            }
        }
        assertTrue(red > 30, "the active rule is written: " + red);
        assertTrue(yellow > 200, "the truck's downward flow is drawn: " + yellow);
    }
}
