import '@testing-library/dom';
