/** Version of the computation core; stored beside every derived figure so a read says which arithmetic made it. */
export const coreVersion = '1.0.0';
