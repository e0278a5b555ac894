"""The notebook front: text/HTML display, the %plotwise magics and the widget panel."""
