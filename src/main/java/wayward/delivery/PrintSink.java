package wayward.delivery;

import java.io.PrintStream;
import wayward.event.Event;
import wayward.event.EventJson;

/** Prints every event phase as one JSON line (standard output of {@code replay} and {@code demo}). */
public final class PrintSink implements EventSink {
    private final PrintStream out;

    public PrintSink(PrintStream out) {
        this.out = out;
    }

    @Override
    public String name() {
        return "standard output";
    }

    @Override
    public void deliver(Event event) {
        out.println(EventJson.toJson(event));
        out.flush();
    }
}
