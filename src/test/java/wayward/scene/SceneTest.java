package wayward.scene;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.ByteBuffer;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.concurrent.TimeUnit;
import org.bytedeco.ffmpeg.global.avutil;
import org.bytedeco.javacv.FFmpegFrameGrabber;
import org.bytedeco.javacv.Frame;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;

/** The scene file's newer keys (texture, sizes, background, flicker, glare), read and rendered. */
class SceneTest {
    private static final String HEAD = "width = 160\nheight = 96\nfps = 10\nseconds = 1\nseed = 7\n";

    private static Scene scene(Path dir, String body) throws Exception {
        Path file = dir.resolve("t.scene.toml");
        Files.writeString(file, HEAD + body);
        return Scene.load(file);
    }

    @Test
    void sizesPerKeyframeAreLinearInBetweenAndTheTextureHasTheLargest(@TempDir Path dir) throws Exception {
        Scene s = scene(dir, """
                [[mover]]
                id = "van"
                path = [[0.0, 0.5, 0.9], [2.0, 0.5, 0.5], [3.0, 0.5, 0.1]]
                size = [0.1, 0.1]
                sizes = [[0.20, 0.30], [0.10, 0.15], [0.04, 0.06]]
                """);
        Scene.Mover m = s.movers().get(0);
        assertArrayEquals(new double[] {0.15, 0.225}, m.sizeAt(1.0), 1e-12);
        assertArrayEquals(new double[] {0.07, 0.105}, m.sizeAt(2.5), 1e-12);
        assertEquals(0.20, m.width());
        assertEquals(0.30, m.height());
    }

    @Test
    void olderScenesReadAsNoiseTexturedMoversOfOneSize(@TempDir Path dir) throws Exception {
        Scene s = scene(dir, """
                [[mover]]
                id = "van"
                from = [0.5, 1.1]
                to = [0.5, -0.1]
                start_s = 0
                end_s = 1
                size = [0.1, 0.16]
                """);
        assertEquals(Scene.Look.NOISE, s.movers().get(0).look());
        assertEquals(null, s.movers().get(0).ws());
        assertEquals(null, s.background());
        assertEquals(null, s.nuisances().flicker());
        assertTrue(s.nuisances().glares().isEmpty());
    }

    @Test
    void aWrongKeyIsNamed(@TempDir Path dir) {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> scene(dir, """
                [[mover]]
                id = "van"
                from = [0.5, 1.1]
                to = [0.5, -0.1]
                start_s = 0
                end_s = 1
                size = [0.1, 0.16]
                texture = "plain"
                rim_px = 3
                """));
        assertTrue(e.getMessage().endsWith("mover[0].rim_px: 3 (expected 0 to 2)"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class, () -> scene(dir, "[flicker]\nkind = \"strobe\"\namplitude = 0.1\nhz = 5\n"));
        assertTrue(e.getMessage().endsWith("flicker.kind: strobe (expected mains or random)"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class, () -> scene(dir, "[[glare]]\nmover = \"ghost\"\nradius = 0.1\nbrightness = 100\n"));
        assertTrue(e.getMessage().endsWith("glare[0].mover: ghost (expected a mover's id)"), e.getMessage());
    }

    @Test
    @Timeout(value = 60, unit = TimeUnit.SECONDS)
    void aMissingPhotographNamesThePackage(@TempDir Path dir) throws Exception {
        Scene s = scene(dir, "background = \"no-such-picture.jpg\"\n");
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> new SceneGenerator(s).write(dir.resolve("v.mp4"), dir.resolve("t.json")));
        assertTrue(e.getMessage().contains("opencv-doc"), e.getMessage());
        assertTrue(e.getMessage().contains("no-such-picture.jpg"), e.getMessage());
    }

    /** A plain box is flat inside with a darker rim, and glare saturates: decoded by FFmpeg (JavaCV). */
    @Test
    @Timeout(value = 60, unit = TimeUnit.SECONDS)
    void plainMoverWithRimAndGlareLookAsScripted(@TempDir Path dir) throws Exception {
        Scene s = scene(dir, """
                bitrate_kbps = 4000
                [[mover]]
                id = "van"
                from = [0.3, 0.5]
                to = [0.3, 0.5001]
                start_s = 0
                end_s = 1
                size = [0.25, 0.4]
                texture = "plain"
                grey = 180
                rim_px = 2
                rim_grey = 60
                [[glare]]
                from = [0.8, 0.5]
                to = [0.8, 0.5]
                start_s = 0
                end_s = 1
                radius = 0.05
                brightness = 400
                """);
        Path video = dir.resolve("v.mp4");
        new SceneGenerator(s).write(video, dir.resolve("t.json"));
        try (FFmpegFrameGrabber g = new FFmpegFrameGrabber(video.toFile())) {
            g.setPixelFormat(avutil.AV_PIX_FMT_GRAY8);
            g.start();
            Frame f = g.grabImage();
            ByteBuffer b = (ByteBuffer) f.image[0];
            int cx = (int) (0.3 * 160);
            int cy = (int) (0.5 * 96);
            int inside = b.get(cy * f.imageStride + cx) & 0xff;
            int rim = b.get(cy * f.imageStride + cx - 20 + 1) & 0xff; // box 40 px wide: x from cx-20, rim 2 px
            int glare = b.get(cy * f.imageStride + (int) (0.8 * 160)) & 0xff;
            assertEquals(180, inside, 6);
            assertTrue(rim < 110, "rim " + rim);
            assertTrue(glare >= 250, "glare " + glare);
            g.stop();
        }
    }
}
