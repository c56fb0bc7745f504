import { DataZoomComponent } from 'echarts/components';
import { echarts } from '../charts/echarts-setup.js';

// The price chart adds a date slider to the parts the scenario page registers.
echarts.use([DataZoomComponent]);

export { echarts };
