package wayward.delivery;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.channels.FileChannel;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import wayward.event.Event;
import wayward.event.EventJson;

/**
 * The event phases one destination will not deliver (refused for good, or impossible to send), kept on disk so
 * that nothing is lost: one JSON object a line in the outbox folder, {@code set-aside-<destination>.jsonl}, with
 * the outbox seq, the reason and the event itself. Written on the destination's courier thread, each line forced
 * to disk.
 */
final class SetAside {
    private final Path file;

    SetAside(Path file) {
        this.file = file;
    }

    Path file() {
        return file;
    }

    void add(long seq, Event event, String reason) throws IOException {
        String line = EventJson.object(g -> {
            g.writeNumberField("seq", seq);
            g.writeStringField("reason", reason);
            g.writeFieldName("event");
            g.writeRawValue(EventJson.toJson(event));
        }) + "\n";
        try (FileChannel ch = FileChannel.open(file, StandardOpenOption.CREATE, StandardOpenOption.WRITE,
                StandardOpenOption.APPEND)) {
            ByteBuffer b = ByteBuffer.wrap(line.getBytes(StandardCharsets.UTF_8));
            while (b.hasRemaining()) {
                ch.write(b);
            }
            ch.force(false);
        }
    }
}
