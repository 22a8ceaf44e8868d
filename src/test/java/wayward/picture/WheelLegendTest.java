package wayward.picture;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.awt.image.BufferedImage;
import java.io.ByteArrayInputStream;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Base64;
import javax.imageio.ImageIO;
import org.junit.jupiter.api.Test;

/**
 * The live view page's colour legend is the wheel FlowColours draws the arrows with: the PNG the page carries
 * (a data: address in view.html, so the page needs no extra request) decodes to the very pixels of
 * {@link FlowColours#wheel}. When the mapping changes, this test writes the new PNG's base64 to
 * target/view-wheel.png.b64 for the page and fails.
 */
class WheelLegendTest {
    private static final String MARK = "src=\"data:image/png;base64,";
    private static final int RADIUS = 32;

    @Test
    void livePageCarriesTheWheelOfTheArrowColours() throws IOException {
        String page;
        try (InputStream in = WheelLegendTest.class.getResourceAsStream("/wayward/http/view.html")) {
            page = new String(in.readAllBytes(), StandardCharsets.UTF_8);
        }
        int from = page.indexOf(MARK);
        assertTrue(from > 0, "view.html carries no wheel picture");
        from += MARK.length();
        String shipped = page.substring(from, page.indexOf('"', from));
        BufferedImage expected = FlowColours.wheel(RADIUS);
        BufferedImage img = ImageIO.read(new ByteArrayInputStream(Base64.getDecoder().decode(shipped)));
        boolean same = img.getWidth() == expected.getWidth() && img.getHeight() == expected.getHeight();
        for (int y = 0; same && y < img.getHeight(); y++) {
            for (int x = 0; x < img.getWidth(); x++) {
                int a = img.getRGB(x, y);
                int b = expected.getRGB(x, y);
                // outside the disc only transparency matters
                if (a != b && !((a >>> 24) == 0 && (b >>> 24) == 0)) {
                    same = false;
                    break;
                }
            }
        }
        if (!same) {
            ByteArrayOutputStream png = new ByteArrayOutputStream();
            ImageIO.write(expected, "png", png);
            Path out = Path.of("target", "view-wheel.png.b64");
            Files.writeString(out, Base64.getEncoder().encodeToString(png.toByteArray()));
        }
        assertTrue(same, "the live page's wheel differs from FlowColours.wheel(" + RADIUS + "): put the base64 of "
                + "target/view-wheel.png.b64 into view.html");
        // the page shows it at its own size
        assertTrue(page.contains("width=\"" + (2 * RADIUS + 1) + "\" height=\"" + (2 * RADIUS + 1) + "\""));
        // the disc's centre is white (no motion) and its rim to the right is the colour of rightward motion
        assertEquals(0xffffff, img.getRGB(RADIUS, RADIUS) & 0xffffff);
        assertEquals(FlowColours.rgb(1, 0), img.getRGB(2 * RADIUS, RADIUS) & 0xffffff);
    }
}
