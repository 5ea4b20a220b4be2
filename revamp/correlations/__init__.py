"""Published heat-transfer and pressure-drop correlations as pure, array-native functions."""
