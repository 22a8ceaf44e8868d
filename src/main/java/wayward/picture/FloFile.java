package wayward.picture;

import java.io.BufferedOutputStream;
import java.io.IOException;
import java.io.OutputStream;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.file.Files;
import java.nio.file.Path;
import wayward.flow.FlowField;

/**
 * Writes a flow field in the Middlebury {@code .flo} format (Baker et al. 2011): the float 202021.25 as a tag
 * (the bytes "PIEH"), the width and the height as 32-bit integers, then per pixel, row by row, u and v as
 * 32-bit floats; all little-endian. A field sampled on a grid is interpolated to every pixel first.
 */
public final class FloFile {
    /** The tag float; its little-endian bytes spell "PIEH". */
    public static final float TAG = 202021.25f;

    private FloFile() {
    }

    public static void write(FlowField field, Path file) throws IOException {
        FlowField f = field.toDense();
        ByteBuffer row = ByteBuffer.allocate(8 * f.width).order(ByteOrder.LITTLE_ENDIAN);
        try (OutputStream out = new BufferedOutputStream(Files.newOutputStream(file))) {
            ByteBuffer head = ByteBuffer.allocate(12).order(ByteOrder.LITTLE_ENDIAN);
            head.putFloat(TAG).putInt(f.width).putInt(f.height);
            out.write(head.array());
            for (int y = 0; y < f.height; y++) {
                row.clear();
                for (int x = 0; x < f.width; x++) {
                    row.putFloat(f.u[y * f.width + x]).putFloat(f.v[y * f.width + x]);
                }
                out.write(row.array());
            }
        }
    }

}
