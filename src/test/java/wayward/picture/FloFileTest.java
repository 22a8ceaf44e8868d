package wayward.picture;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.awt.image.BufferedImage;
import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import javax.imageio.ImageIO;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import wayward.cli.Main;
import wayward.flow.FlowField;

class FloFileTest {
    /**
     * A reader written from the published description of the Middlebury .flo format (Baker et al. 2011,
     * "flow-code/README.txt", from memory): bytes 0–3 "PIEH" (the float 202021.25), then width and height as
     * 4-byte little-endian integers, then width × height pairs (u, v) of little-endian 32-bit floats, row-major.
     */
    static float[][] readFlo(Path file) throws Exception {
        ByteBuffer b = ByteBuffer.wrap(Files.readAllBytes(file)).order(ByteOrder.LITTLE_ENDIAN);
        byte[] tag = new byte[4];
        b.get(tag);
        assertEquals("PIEH", new String(tag, StandardCharsets.US_ASCII), "tag");
        int w = b.getInt();
        int h = b.getInt();
        assertEquals(12L + 8L * w * h, Files.size(file), "file length");
        float[][] uv = new float[2][w * h];
        for (int i = 0; i < w * h; i++) {
            uv[0][i] = b.getFloat();
            uv[1][i] = b.getFloat();
        }
        return new float[][] {{w, h}, uv[0], uv[1]};
    }

    @Test
    void writesWhatTheFormatDescriptionReadsBack(@TempDir Path dir) throws Exception {
        FlowField f = new FlowField(7, 3);
        for (int i = 0; i < 21; i++) {
            f.u[i] = i * 0.5f - 3;
            f.v[i] = -i * 0.25f;
        }
        Path flo = dir.resolve("f.flo");
        FloFile.write(f, flo);
        float[][] back = readFlo(flo);
        assertEquals(7, (int) back[0][0]);
        assertEquals(3, (int) back[0][1]);
        for (int i = 0; i < 21; i++) {
            assertEquals(f.u[i], back[1][i]);
            assertEquals(f.v[i], back[2][i]);
        }
    }

    @Test
    void gridFieldIsWrittenAtPictureResolution(@TempDir Path dir) throws Exception {
        FlowField f = new FlowField(16, 8, 4);
        java.util.Arrays.fill(f.u, 2f);
        Path flo = dir.resolve("g.flo");
        FloFile.write(f, flo);
        float[][] back = readFlo(flo);
        assertEquals(16, (int) back[0][0]);
        assertEquals(8, (int) back[0][1]);
        for (float u : back[1]) {
            assertEquals(2f, u, 1e-6f);
        }
    }

    @Test
    void pictureHasTheWheelAsLegend() {
        FlowField f = new FlowField(40, 30);
        java.util.Arrays.fill(f.u, 3f); // everything moves right: one colour, the wheel's rim to the right
        BufferedImage img = FlowColours.picture(f);
        int rightRim = FlowColours.rgb(1, 0);
        assertEquals(rightRim, img.getRGB(5, 5) & 0xffffff);
        assertEquals(rightRim, img.getRGB(39, 29) & 0xffffff);
        // legend disc: white at the centre (no motion), saturated towards the rim, to the right of the field
        int legend = img.getWidth() - 40;
        int cx = 40 + legend / 2;
        int cy = legend / 2;
        assertEquals(0xffffff, img.getRGB(cx, cy) & 0xffffff);
        int r = legend / 2 - 8;
        assertEquals(FlowColours.rgb((double) (r - 1) / r, 0), img.getRGB(cx + r - 1, cy) & 0xffffff);
        // opposite directions get different hues (common practice for this coding)
        assertTrue(FlowColours.rgb(1, 0) != FlowColours.rgb(-1, 0));
        assertTrue(FlowColours.rgb(0, 1) != FlowColours.rgb(0, -1));
    }

    @Test
    void flowCommandOnARealImagePair(@TempDir Path dir) throws Exception {
        // rubberwhale1/2: a real pair from the Middlebury flow data set, shipped by Debian's opencv-doc
        Path data = Path.of("/usr/share/doc/opencv-doc/examples/data");
        Path flo = dir.resolve("whale.flo");
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        ByteArrayOutputStream err = new ByteArrayOutputStream();
        int code = Main.execute(new String[] {"flow", "--input", data.resolve("rubberwhale1.png").toString(),
            "--input", data.resolve("rubberwhale2.png").toString(), "--output", flo.toString()},
                new PrintStream(out, true, StandardCharsets.UTF_8), new PrintStream(err, true, StandardCharsets.UTF_8));
        assertEquals(0, code, err.toString(StandardCharsets.UTF_8));
        float[][] back = readFlo(flo);
        assertEquals(584, (int) back[0][0]);
        assertEquals(388, (int) back[0][1]);
        // the pair's motions are small (a few pixels): every vector finite and under 10 px
        for (int i = 0; i < back[1].length; i++) {
            assertTrue(Float.isFinite(back[1][i]) && Math.hypot(back[1][i], back[2][i]) < 10, "vector " + i);
        }
        BufferedImage png = ImageIO.read(dir.resolve("whale.png").toFile());
        assertTrue(png.getWidth() > 584 && png.getHeight() == 388, png.getWidth() + "x" + png.getHeight());
        // not a blank picture: many distinct colours
        java.util.Set<Integer> colours = new java.util.HashSet<>();
        for (int y = 0; y < 388; y += 4) {
            for (int x = 0; x < 584; x += 4) {
                colours.add(png.getRGB(x, y));
            }
        }
        assertTrue(colours.size() > 500, colours.size() + " colours");
    }
}
